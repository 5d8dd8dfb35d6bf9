import { describe, expect, it } from 'vitest';
import { nfwHalo } from '../../../src/lens/darkHalo/nfwHalo.js';
import { fastNfwHalo } from '../../../src/lens/darkHalo/fastNfwHalo.js';
import { generalisedNfwHalo } from '../../../src/lens/darkHalo/generalisedNfwHalo.js';
import { fastGeneralisedNfwHalo } from '../../../src/lens/darkHalo/fastGeneralisedNfwHalo.js';
import { deflections, gridPoints, worstTwinDifference } from '../twinComparison.js';

// 2,501 points over a 5" square (60 x 60 grid is too slow for the reference's 42 Gaussians per point).
const points = gridPoints(50, 2.5, 0.03, -0.05);

describe('fast elliptical NFW against the reference', () => {
  // The table interpolates the reference's own deflection (deflectionTable/): measured worst
  // 1.4e-6 relative at q = 0.43 (near the minor axis) and below 6e-7 at q >= 0.7, but 1.8e-5 at
  // q = 0.22, where the axis-ratio nodes (0.025 apart) are coarse for the shape's change. Bounds
  // 3e-6 and 3e-5.
  for (const [q, scaleRadius, angle, bound] of [[0.22, 5, 10, 3e-5], [0.43, 8, 30, 3e-6], [0.77, 12, -70, 3e-6], [0.99, 8, 100, 3e-6], [1, 3, 0, 3e-6]]) {
    it(`q = ${q}, theta_s = ${scaleRadius}", angle ${angle} deg`, () => {
      const p = Float64Array.of(0.2, scaleRadius, q, angle, 0.03, -0.05);
      fastNfwHalo.addDeflection(p, 0, points.x, points.y, points.n, new Float64Array(points.n), new Float64Array(points.n));
      expect(worstTwinDifference(nfwHalo, fastNfwHalo, p, points)).toBeLessThan(bound);
    });
  }
  it('uses the reference where the table does not reach', () => {
    // q below the last node (0.2), and points within 1e-4 theta_s of the centre: the same numbers.
    const low = Float64Array.of(0.2, 8, 0.15, 30, 0.03, -0.05);
    expect(deflections(fastNfwHalo, low, points)).toEqual(deflections(nfwHalo, low, points));
    const near = { x: Float64Array.of(0.03 + 1e-5, 0.03), y: Float64Array.of(-0.05, -0.05 + 2e-4), n: 2 };
    const p = Float64Array.of(0.2, 8, 0.6, 30, 0.03, -0.05);
    fastNfwHalo.addDeflection(p, 0, points.x, points.y, points.n, new Float64Array(points.n), new Float64Array(points.n));
    const [fx] = deflections(fastNfwHalo, p, near), [rx] = deflections(nfwHalo, p, near);
    expect(fx[0]).toBe(rx[0]);
    expect(Math.abs(fx[1] / rx[1] - 1)).toBeLessThan(3e-6);
  });
});

describe('fast elliptical generalised NFW against the reference', () => {
  // Interpolation along the inner-slope axis (nodes 0.1 apart) adds to the error: measured worst
  // 2.0e-6 at gamma = 0.35 and 1.37, 8.3e-6 at gamma = 1.85 (near 0.01 r_s, where the cusp's
  // slope changes most with gamma); 1.5e-5.
  for (const [gamma, q] of [[0.35, 0.55], [1.37, 0.71], [1.85, 0.9]]) {
    it(`gamma = ${gamma}, q = ${q}`, () => {
      const p = Float64Array.of(0.15, 7, q, -30, 0.03, -0.05, gamma);
      fastGeneralisedNfwHalo.addDeflection(p, 0, points.x, points.y, points.n, new Float64Array(points.n), new Float64Array(points.n));
      expect(worstTwinDifference(generalisedNfwHalo, fastGeneralisedNfwHalo, p, points)).toBeLessThan(1.5e-5);
    });
  }
});
