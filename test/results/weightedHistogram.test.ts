// Tests of src/results/weightedHistogram.ts.
import normalCdf from '@stdlib/stats/base/dists/normal/cdf';
import normal from '@stdlib/random/base/normal';
import { describe, expect, it } from 'vitest';
import { weightedHistogram1d, weightedHistogram2d } from '../../src/results/index.js';

describe('weightedHistogram1d', () => {
  it('bins a worked example by hand', () => {
    // Bins [0, 1) and [1, 2]: 0 and 0.5 (weights 1 + 2) in the first, 1 and 2 (3 + 4) in the second,
    // -1 (weight 5) outside. Total weight 15, bin width 1.
    const histogram = weightedHistogram1d([0, 0.5, 1, 2, -1], [1, 2, 3, 4, 5], 2, [0, 2]);
    expect(Array.from(histogram.edges)).toEqual([0, 1, 2]);
    expect(Array.from(histogram.densities)).toEqual([3 / 15, 7 / 15]);
    expect(histogram.enclosedMass).toBe(10 / 15);
  });

  it('reproduces normal bin probabilities within binomial error', () => {
    // Bin probabilities from the normal CDF of @stdlib/stats; each bin count is binomial, and every
    // one of the 24 bins must lie within 4 binomial sigma (a fixed seed, so the draw is the same each run).
    const count = 100_000;
    const draw = normal.factory(0, 1, { seed: 7 });
    const values = new Float64Array(count);
    for (let i = 0; i < count; i++) values[i] = draw();
    const weights = new Float64Array(count).fill(0.5);
    const histogram = weightedHistogram1d(values, weights, 24, [-3, 3]);
    const width = 0.25;
    for (let bin = 0; bin < 24; bin++) {
      const p = normalCdf(histogram.edges[bin + 1], 0, 1) - normalCdf(histogram.edges[bin], 0, 1);
      const observed = histogram.densities[bin] * width * count;
      expect(Math.abs(observed - count * p)).toBeLessThan(4 * Math.sqrt(count * p * (1 - p)));
    }
    const inside = normalCdf(3, 0, 1) - normalCdf(-3, 0, 1);
    expect(Math.abs(histogram.enclosedMass - inside)).toBeLessThan(4 * Math.sqrt((inside * (1 - inside)) / count));
  });
});

describe('weightedHistogram2d', () => {
  it('stores cell (ix, iy) at iy * xBinCount + ix, worked by hand', () => {
    // x bins [0, 1), [1, 2), [2, 3]; y bins [0, 2), [2, 4]; cell area 2; total weight 10.
    // (0.5, 0.5) w1 -> (0, 0); (2.5, 1) w2 -> (2, 0); (1.5, 3) w3 -> (1, 1); (3, 4) w4 -> (2, 1).
    const histogram = weightedHistogram2d([0.5, 2.5, 1.5, 3], [0.5, 1, 3, 4], [1, 2, 3, 4], 3, [0, 3], 2, [0, 4]);
    expect(Array.from(histogram.xEdges)).toEqual([0, 1, 2, 3]);
    expect(Array.from(histogram.yEdges)).toEqual([0, 2, 4]);
    // densities = weight * (cells per unit area) / total: equal to the hand values to rounding.
    [1 / 20, 0, 2 / 20, 0, 3 / 20, 4 / 20].forEach((expected, cell) => expect(histogram.densities[cell]).toBeCloseTo(expected, 15));
    expect(histogram.enclosedMass).toBe(1);
  });

  it('leaves out points outside either range and rejects bad binning', () => {
    const histogram = weightedHistogram2d([0.5, 5, 0.5], [0.5, 0.5, -1], [1, 1, 1], 1, [0, 1], 1, [0, 1]);
    expect(histogram.enclosedMass).toBe(1 / 3);
    expect(() => weightedHistogram2d([0], [0], [1], 0, [0, 1], 1, [0, 1])).toThrow(/bin count: expected an integer >= 1, found 0/);
    expect(() => weightedHistogram1d([0], [1], 2, [1, 1])).toThrow(/range: expected finite \[low, high\] with low < high/);
  });
});
