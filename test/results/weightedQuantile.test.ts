// Tests of src/results/weightedQuantile.ts, credibleInterval.ts, upperLimit.ts, parameterSummary.ts.
import normalQuantile from '@stdlib/stats/base/dists/normal/quantile';
import dmediansorted from '@stdlib/stats/strided/dmediansorted';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  credibleInterval,
  parameterSummary,
  upperLimit,
  weightedQuantile,
  weightedQuantiles,
} from '../../src/results/index.js';
import { weightsFromLogWeights } from '../../src/numeric/index.js';
import { readResultsFixture } from './fixtureFile.js';

interface QuantileSet {
  values: number[];
  probabilities: number[];
  quantiles: number[];
}

// Made by test/results/fixtures/make_quantiles.py with numpy.quantile(method='hazen'), definition 5
// of Hyndman & Fan 1996, which is what weightedQuantiles gives for equal weights.
const fixture = readResultsFixture<{ sets: QuantileSet[] }>('quantiles.json');

/** Gaussian weights exp(-x^2 / 2 sigma^2) on a uniform grid over mean +- 8 sigma. */
function gaussianGrid(mean: number, sigma: number, points: number): { values: Float64Array; weights: Float64Array } {
  const values = new Float64Array(points);
  const weights = new Float64Array(points);
  for (let i = 0; i < points; i++) {
    const t = -8 + (16 * i) / (points - 1);
    values[i] = mean + sigma * t;
    weights[i] = Math.exp(-0.5 * t * t);
  }
  return { values, weights };
}

describe('weightedQuantiles with equal weights', () => {
  it('match numpy hazen quantiles (Hyndman & Fan definition 5)', () => {
    for (const set of fixture.sets) {
      const weights = new Float64Array(set.values.length).fill(1);
      const got = weightedQuantiles(set.values, weights, set.probabilities);
      // Both sides interpolate the same two doubles; a few ulps of the values' size allowed.
      got.forEach((q, k) => expect(q).toBeCloseTo(set.quantiles[k], 12));
    }
  });

  it('give the median of @stdlib/stats dmediansorted, in any order and any weight scale', () => {
    for (const set of fixture.sets) {
      const sorted = Float64Array.from(set.values).sort();
      const median = dmediansorted(sorted.length, sorted, 1);
      const shuffled = Float64Array.from(set.values).reverse();
      const weights = new Float64Array(set.values.length).fill(3.7);
      expect(weightedQuantile(shuffled, weights, 0.5)).toBeCloseTo(median, 13);
    }
  });
});

describe('weightedQuantiles with weights', () => {
  // Weights of a Gaussian density on a uniform grid: the sample positions c_k are the trapezoid rule
  // for the normal CDF at the grid points, so the quantiles converge to the normal quantiles as h^2.
  // With 16001 points (h = 0.001 sigma) the error measured was at most 2.4e-7 sigma (and 100 times
  // that with 1601 points, as h^2 predicts); 1e-6 sigma leaves a margin of 4.
  const sigma = 2.5;
  const mean = -1.25;
  const { values, weights } = gaussianGrid(mean, sigma, 16001);
  const tolerance = 1e-6 * sigma;

  it('give the median and central 68% and 95% intervals of a normal distribution', () => {
    const summary = parameterSummary(values, weights);
    // Normal quantiles from @stdlib/stats: Phi^-1(0.84) = 0.9945 (central 68%), Phi^-1(0.975) = 1.9600.
    const z68 = normalQuantile(0.84, 0, 1);
    const z95 = normalQuantile(0.975, 0, 1);
    expect(z68).toBeCloseTo(0.9945, 4);
    expect(Math.abs(summary.median - mean)).toBeLessThan(tolerance);
    expect(Math.abs(summary.interval68.lower - (mean - z68 * sigma))).toBeLessThan(tolerance);
    expect(Math.abs(summary.interval68.upper - (mean + z68 * sigma))).toBeLessThan(tolerance);
    expect(Math.abs(summary.interval95.lower - (mean - z95 * sigma))).toBeLessThan(tolerance);
    expect(Math.abs(summary.interval95.upper - (mean + z95 * sigma))).toBeLessThan(tolerance);
  });

  it('credibleInterval and upperLimit follow the normal quantiles too', () => {
    const interval = credibleInterval(values, weights, 0.9);
    const z90 = normalQuantile(0.95, 0, 1);
    expect(Math.abs(interval.lower - (mean - z90 * sigma))).toBeLessThan(tolerance);
    expect(Math.abs(interval.upper - (mean + z90 * sigma))).toBeLessThan(tolerance);
    expect(Math.abs(upperLimit(values, weights) - normalQuantile(0.95, mean, sigma))).toBeLessThan(tolerance);
    expect(Math.abs(upperLimit(values, weights, 0.99) - normalQuantile(0.99, mean, sigma))).toBeLessThan(tolerance);
  });

  it('work the same from log weights, and ignore zero-weight samples', () => {
    const lnWeight = Float64Array.from(weights, (w) => Math.log(w) - 1234.5);
    const fromLog = weightsFromLogWeights(lnWeight);
    expect(weightedQuantile(values, fromLog, 0.84)).toBeCloseTo(weightedQuantile(values, weights, 0.84), 12);
    // A far outlier of weight 0 changes nothing.
    const withOutlier = Float64Array.from([...values, 1e6]);
    const outlierWeights = Float64Array.from([...weights, 0]);
    expect(weightedQuantile(withOutlier, outlierWeights, 1)).toBe(weightedQuantile(values, weights, 1));
  });

  it('interpolate between step midpoints on a two-point worked example', () => {
    // Values 0 and 10 with weights 1 and 3: positions c = 0.5 / 4 = 0.125 and (1 + 1.5) / 4 = 0.625.
    // q = 0.375 lies halfway: 5. Below 0.125 the quantile is 0, above 0.625 it is 10.
    expect(weightedQuantiles([10, 0], [3, 1], [0.1, 0.375, 0.5, 0.7])).toEqual([0, 5, 7.5, 10]);
  });
});

describe('input checks', () => {
  it('name the bad weight, value or probability', () => {
    expect(() => weightedQuantile([1, 2], [1, -1], 0.5)).toThrow(/weight 1: expected a finite number >= 0, found -1/);
    expect(() => weightedQuantile([1, NaN], [1, 1], 0.5)).toThrow(/value 1: expected a finite number/);
    expect(() => weightedQuantile([1, 2], [0, 0], 0.5)).toThrow(/positive finite sum/);
    expect(() => weightedQuantile([1, 2], [1], 0.5)).toThrow(InputError);
    expect(() => weightedQuantile([1, 2], [1, 1], 1.5)).toThrow(/quantile probability: expected a number from 0 to 1, found 1.5/);
    expect(() => upperLimit([1, 2], [1, 1], -0.1)).toThrow(InputError);
  });
});
