// Test helper: the axisymmetric-lens reference checks shared by the perturber tests.
import type { MassProfile } from '../../src/lens/massProfile.js';
import { convergenceAt, deflectionAt } from '../lens/profileProbes.js';
import { integrateTanhSinh } from './doubleExponential.js';

/**
 * A profile with its parameters, centre and a fixed direction along which radii are probed.
 * Radial checks reach radii far below the rounding step of an off-origin centre (1e-23 arcsec
 * at the tanh-sinh end nodes), so probes are built with the centre at the origin; the tests
 * exercise off-centre profiles through the divergence, potential and lens-equation checks.
 */
export interface RadialProbe {
  profile: MassProfile;
  p: Float64Array;
  centerX: number;
  centerY: number;
  directionRad: number;
}

export function pointAtRadius(probe: RadialProbe, radius: number): [number, number] {
  return [
    probe.centerX + radius * Math.cos(probe.directionRad),
    probe.centerY + radius * Math.sin(probe.directionRad),
  ];
}

export function convergenceAtRadius(probe: RadialProbe, radius: number): number {
  const [x, y] = pointAtRadius(probe, radius);
  return convergenceAt(probe.profile, probe.p, x, y);
}

/** Deflection at the given radius, projected on the outward radial direction, and its transverse part. */
export function radialDeflection(probe: RadialProbe, radius: number): { radial: number; transverse: number } {
  const [x, y] = pointAtRadius(probe, radius);
  const [ax, ay] = deflectionAt(probe.profile, probe.p, x, y);
  const c = Math.cos(probe.directionRad), s = Math.sin(probe.directionRad);
  return { radial: ax * c + ay * s, transverse: -ax * s + ay * c };
}

/**
 * Bound on |transverse / radial| deflection at a radius: the probe point's coordinates are rounded
 * to about 1.1e-16 (|centre| + r), which turns the direction by that over r; a factor 8 for the
 * further rounding inside the profile. A correct axisymmetric profile has no transverse part.
 */
export function transverseToleranceFor(probe: RadialProbe): (radius: number) => number {
  const offset = Math.abs(probe.centerX) + Math.abs(probe.centerY);
  return (radius) => (8 * Number.EPSILON * (offset + radius)) / radius;
}

// Axisymmetric lens: alpha(r) = (2/r) int_0^r kappa(r') r' dr' (Schneider, Ehlers & Falco 1992,
// Gravitational Lenses, axially symmetric lenses), by tanh-sinh quadrature of the profile's own
// kappa, split at the given break radii where the integrand changes character.
export function deflectionFromConvergence(probe: RadialProbe, radius: number, breaks: readonly number[]): number {
  const edges = [0, ...breaks.filter((b) => b > 0 && b < radius).sort((a, b) => a - b), radius];
  let integral = 0;
  for (let k = 0; k + 1 < edges.length; k++) {
    integral += integrateTanhSinh((r) => convergenceAtRadius(probe, r) * r, edges[k], edges[k + 1]);
  }
  return (2 / radius) * integral;
}
