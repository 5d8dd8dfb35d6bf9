import { describe, expect, it } from 'vitest';
import { nfw } from '../../src/perturber/nfw.js';
import {
  annulusPoints, convergenceAt, deflectionAt, halfDivergence, potentialGradient, relativeVectorError,
} from '../lens/profileProbes.js';
import { integrateExpSinh } from './doubleExponential.js';
import {
  convergenceAtRadius, deflectionFromConvergence, radialDeflection, transverseToleranceFor, type RadialProbe,
} from './radialChecks.js';

const kappaS = 0.23, thetaS = 0.7, cx = 0.13, cy = -0.21;
const p = Float64Array.of(kappaS, thetaS, cx, cy);
const probe: RadialProbe = {
  profile: nfw, p: Float64Array.of(kappaS, thetaS, 0, 0), centerX: 0, centerY: 0, directionRad: 0.4,
};
const transverseTolerance = transverseToleranceFor(probe);

// Radii in units of r_s: the centre region, both sides of the change of form for h at x = 1/2
// and of the series switch at |x^2 - 1| = 0.02,
// x = 1 itself and its neighbours, and the outskirts.
const radiiOverScale = [
  1e-6, 1e-3, 0.05, 0.3, 0.5 - 1e-9, 0.5, 0.9, Math.sqrt(0.98) - 1e-9, Math.sqrt(0.98) + 1e-9, 1 - 1e-7, 1,
  1 + 1e-7, Math.sqrt(1.02) - 1e-9, Math.sqrt(1.02) + 1e-9, 1.5, 4, 30, 300,
];

// NFW density in units of rho_s, u = r / r_s (Navarro, Frenk & White 1996).
const nfwDensity = (u: number): number => 1 / (u * (1 + u) * (1 + u));

describe('NFW convergence against line-of-sight projection of the 3-D density', () => {
  // kappa(x) = Sigma / Sigma_crit = 2 kappa_s int_0^inf rho(sqrt(x^2 + z^2)) / rho_s dz, z in r_s,
  // by exp-sinh quadrature (asked 1e-13). 1e-10 relative allows for the quadrature and rounding.
  for (const xr of radiiOverScale) {
    it(`x = ${xr}`, () => {
      const reference = 2 * kappaS * integrateExpSinh((z) => nfwDensity(Math.hypot(xr, z)), Math.max(xr, 1e-3));
      const found = convergenceAtRadius(probe, xr * thetaS);
      expect(Math.abs(found / reference - 1)).toBeLessThan(1e-10);
    });
  }
});

describe('NFW deflection against the integrated convergence', () => {
  // alpha(r) = (2/r) int_0^r kappa r' dr' (axisymmetric lens), tanh-sinh split at r_s; the
  // convergence is itself checked above. 1e-10 relative: both quadratures ask 1e-13.
  for (const xr of radiiOverScale) {
    it(`x = ${xr}`, () => {
      const radius = xr * thetaS;
      const reference = deflectionFromConvergence(probe, radius, [thetaS]);
      const { radial, transverse } = radialDeflection(probe, radius);
      expect(Math.abs(radial / reference - 1)).toBeLessThan(1e-10);
      expect(Math.abs(transverse / reference)).toBeLessThan(transverseTolerance(radius));
    });
  }
  it('is zero at the exact centre, where the convergence stays finite', () => {
    expect(deflectionAt(nfw, p, cx, cy)).toEqual([0, 0]);
    const kappa = convergenceAt(nfw, p, cx, cy);
    expect(Number.isFinite(kappa) && kappa > 0).toBe(true);
  });
});

describe('NFW convergence and potential against numerical derivatives', () => {
  // Central differences with step h = 1e-4 r: truncation error ~ (h/r)^2 ~ 1e-8 relative, rounding
  // ~ 1e-16 / 1e-4 = 1e-12; 1e-6 leaves room for the larger third derivatives near the centre.
  const points = [...annulusPoints(40, 0.03 * thetaS, 10 * thetaS, cx, cy),
    [cx + thetaS, cy] as [number, number], [cx, cy + 1.00001 * thetaS] as [number, number]];
  it('kappa equals half the divergence of alpha', () => {
    for (const [x, y] of points) {
      const h = 1e-4 * Math.hypot(x - cx, y - cy);
      const kappa = convergenceAt(nfw, p, x, y);
      expect(Math.abs(halfDivergence(nfw, p, x, y, h) / kappa - 1)).toBeLessThan(1e-6);
    }
  });
  it('alpha equals the gradient of the potential', () => {
    for (const [x, y] of points) {
      const h = 1e-4 * Math.hypot(x - cx, y - cy);
      expect(relativeVectorError(potentialGradient(nfw, p, x, y, h), deflectionAt(nfw, p, x, y))).toBeLessThan(1e-6);
    }
  });
});
