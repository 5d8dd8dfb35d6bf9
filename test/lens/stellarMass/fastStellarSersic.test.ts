import { describe, expect, it } from 'vitest';
import { stellarSersic } from '../../../src/lens/stellarMass/stellarSersic.js';
import { fastStellarSersic } from '../../../src/lens/stellarMass/fastStellarSersic.js';
import { deflections, gridPoints, worstTwinDifference } from '../twinComparison.js';

const points = gridPoints(50, 2.5, -0.02, 0.04);
const call = (p: Float64Array): void => {
  fastStellarSersic.addDeflection(p, 0, points.x, points.y, points.n, new Float64Array(points.n), new Float64Array(points.n));
};

describe('fast Sersic stellar mass against the reference', () => {
  // Measured worst 3.7e-6 (n = 1) and below for q >= 0.6, 1.5e-5 at q = 0.35 (near the minor
  // axis, n = 6); bounds 1e-5 and 3e-5.
  for (const [n, eta, q, radius, bound] of [[4, 0, 0.83, 1.1, 1e-5], [2.3, -0.23, 0.62, 0.8, 1e-5], [6, 0.35, 0.35, 1.6, 3e-5], [1, 0, 0.95, 0.5, 1e-5]]) {
    it(`n = ${n}, eta = ${eta}, q = ${q}, R_e = ${radius}"`, () => {
      const p = Float64Array.of(0.5, radius, n, q, 30, -0.02, 0.04, eta);
      call(p);
      call(p);
      expect(worstTwinDifference(stellarSersic, fastStellarSersic, p, points)).toBeLessThan(bound);
    });
  }
  it('runs the reference for a Sersic index seen once, and tabulates it when it comes again', () => {
    // A fit that samples the index would build a table per call; the first sighting uses the reference.
    const p = Float64Array.of(0.5, 1, 3.21, 0.7, 30, -0.02, 0.04, 0);
    expect(deflections(fastStellarSersic, p, points)).toEqual(deflections(stellarSersic, p, points));
    const [fx] = deflections(fastStellarSersic, p, points), [rx] = deflections(stellarSersic, p, points);
    expect(fx).not.toEqual(rx);
    expect(worstTwinDifference(stellarSersic, fastStellarSersic, p, points)).toBeLessThan(1e-5);
  });
});
