import { describe, expect, it } from 'vitest';
import { ellipticalGaussian } from '../../src/light/ellipticalGaussian.js';
import { valueAt } from './valueAt.js';

describe('elliptical Gaussian light profile', () => {
  it('declares its parameters and one basis function', () => {
    expect(ellipticalGaussian.parameterNames).toEqual([
      'sigmaArcsec', 'axisRatio', 'positionAngleDeg', 'centerXArcsec', 'centerYArcsec',
    ]);
    expect(ellipticalGaussian.basisCount).toBe(1);
  });

  it('integrates to 1 over the plane (midpoint rule on a Cartesian grid)', () => {
    // sigma 0.2 arcsec, q = 0.4: major-axis dispersion 0.2 / sqrt(0.4) = 0.32 arcsec. The grid
    // spans +-4 arcsec (12 major-axis dispersions: the tail beyond is < 1e-30) with step
    // 0.01 arcsec. The midpoint rule on a Gaussian converges faster than any power of the step
    // (Euler-Maclaurin: all end corrections vanish), error here far below 1e-12 (common practice).
    const p = Float64Array.of(0.2, 0.4, 63, 0.17, -0.31);
    const step = 0.01;
    const side = 800;
    const x = new Float64Array(side * side);
    const y = new Float64Array(side * side);
    for (let j = 0; j < side; j++) {
      for (let i = 0; i < side; i++) {
        x[j * side + i] = -4 + (i + 0.5) * step;
        y[j * side + i] = -4 + (j + 0.5) * step;
      }
    }
    const values = new Float64Array(side * side);
    ellipticalGaussian.writeBasis(p, 0, x, y, side * side, values, 0, side * side);
    let sum = 0;
    for (let k = 0; k < values.length; k++) sum += values[k];
    expect(Math.abs(sum * step * step - 1)).toBeLessThan(1e-12);
  });

  it('position angle counter-clockwise from +x and centre: hand-computed points', () => {
    // sigma 1, q = 0.25, PA = 60 deg, centre (-1, 0.5). On the major axis (direction 60 deg)
    // the dispersion is sigma / sqrt(q) = 2; on the minor axis (150 deg) sigma sqrt(q) = 0.5.
    const p = Float64Array.of(1, 0.25, 60, -1, 0.5);
    const peak = 1 / (2 * Math.PI);
    const c = Math.cos(Math.PI / 3);
    const s = Math.sin(Math.PI / 3);
    expect(valueAt(ellipticalGaussian, p, -1, 0.5)).toBeCloseTo(peak, 14);
    expect(valueAt(ellipticalGaussian, p, -1 + 2 * c, 0.5 + 2 * s) / peak).toBeCloseTo(Math.exp(-0.5), 13);
    expect(valueAt(ellipticalGaussian, p, -1 - 0.5 * s, 0.5 + 0.5 * c) / peak).toBeCloseTo(Math.exp(-0.5), 13);
    expect(valueAt(ellipticalGaussian, p, -1 + 4 * c, 0.5 + 4 * s) / peak).toBeCloseTo(Math.exp(-2), 13);
    // The clockwise reading (direction -60 deg) would put a 1-sigma point here; it is not.
    expect(valueAt(ellipticalGaussian, p, -1 + 2 * c, 0.5 - 2 * s) / peak).toBeLessThan(0.01);
  });
});
