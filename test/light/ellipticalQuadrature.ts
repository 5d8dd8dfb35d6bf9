import type { LightProfile } from '../../src/light/lightProfile.js';

export interface EllipseGeometry {
  readonly axisRatio: number;
  readonly positionAngleDeg: number;
  readonly centerXArcsec: number;
  readonly centerYArcsec: number;
}

/**
 * Integral of basis 0 of `profile` over the elliptical annulus rMin < R < rMax, in elliptical
 * coordinates: x' = R cos(t) / sqrt(q), y' = R sqrt(q) sin(t), rotated by the position angle
 * and shifted to the centre, so dx dy = R dR dt. Radially: composite Simpson in s = ln R
 * (integrand f(R) R^2 ds) with `radialSteps` (even) steps; in angle: the periodic trapezoid
 * rule with `angleSteps` points, exact for an integrand that depends on R only.
 */
export function integrateOverEllipse(
  profile: LightProfile, p: Float64Array, geometry: EllipseGeometry,
  rMin: number, rMax: number, radialSteps: number, angleSteps: number,
): number {
  const sMin = Math.log(rMin);
  const step = (Math.log(rMax) - sMin) / radialSteps;
  const count = (radialSteps + 1) * angleSteps;
  const x = new Float64Array(count);
  const y = new Float64Array(count);
  const weight = new Float64Array(count);
  const angle = (geometry.positionAngleDeg * Math.PI) / 180;
  const rootQ = Math.sqrt(geometry.axisRatio);
  let index = 0;
  for (let m = 0; m <= radialSteps; m++) {
    const radius = Math.exp(sMin + m * step);
    const simpson = m === 0 || m === radialSteps ? 1 : m % 2 === 1 ? 4 : 2;
    for (let k = 0; k < angleSteps; k++) {
      const t = (2 * Math.PI * (k + 0.5)) / angleSteps;
      const along = (radius * Math.cos(t)) / rootQ;
      const across = radius * rootQ * Math.sin(t);
      x[index] = geometry.centerXArcsec + along * Math.cos(angle) - across * Math.sin(angle);
      y[index] = geometry.centerYArcsec + along * Math.sin(angle) + across * Math.cos(angle);
      weight[index] = ((simpson * step) / 3) * radius * radius * ((2 * Math.PI) / angleSteps);
      index++;
    }
  }
  const values = new Float64Array(count);
  profile.writeBasis(p, 0, x, y, count, values, 0, count);
  let sum = 0;
  for (let i = 0; i < count; i++) sum += weight[i] * values[i];
  return sum;
}
