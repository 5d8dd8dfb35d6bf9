// Tests of src/results/cornerData.ts.
import normalCdf from '@stdlib/stats/base/dists/normal/cdf';
import normalQuantile from '@stdlib/stats/base/dists/normal/quantile';
import normal from '@stdlib/random/base/normal';
import { describe, expect, it } from 'vitest';
import {
  cornerData,
  densityLevels,
  parameterColumn,
  parameterSummary,
  smoothHistogram2d,
  weightedHistogram2d,
} from '../../src/results/index.js';
import { kishEffectiveSampleSize } from '../../src/numeric/index.js';

// Importance-weighted samples of independent normals N(mean_j, sigma_j^2): drawn from normals 1.5
// times wider, weighted by the density ratio exp(-t^2/2 + t^2/(2 * 1.5^2)) with t in proposal sigmas.
const MEANS = [1, -2, 30];
const SIGMAS = [0.5, 3, 0.01];
const COUNT = 60_000;
function weightedNormals(seed: number): { points: Float64Array; weights: Float64Array } {
  const draw = normal.factory(0, 1, { seed });
  const points = new Float64Array(COUNT * 3);
  const weights = new Float64Array(COUNT);
  for (let i = 0; i < COUNT; i++) {
    let lnWeight = 0;
    for (let j = 0; j < 3; j++) {
      const z = 1.5 * draw();
      points[i * 3 + j] = MEANS[j] + SIGMAS[j] * z;
      lnWeight += -0.5 * z * z + (0.5 * z * z) / 2.25;
    }
    weights[i] = Math.exp(lnWeight);
  }
  return { points, weights };
}

describe('cornerData', () => {
  const { points, weights } = weightedNormals(5);
  const names = ['thetaE', 'logMass', 'x'];
  const units = ['arcsec', 'log10 Msun', 'arcsec'];
  const data = cornerData(names, units, points, weights);
  const effective = kishEffectiveSampleSize(weights);

  it('is plain JSON: it survives JSON.stringify and JSON.parse unchanged', () => {
    expect(JSON.parse(JSON.stringify(data))).toEqual(data);
    expect(data.parameters.map((p) => [p.name, p.unit])).toEqual(names.map((name, j) => [name, units[j]]));
    expect(data.smoothingSigmaBins).toBe(0);
  });

  it('takes default ranges at the 0.1% and 99.9% quantiles padded by 5%, as for a normal distribution', () => {
    // Normal quantile z = Phi^-1(0.999) = 3.0902 (@stdlib/stats); padding 5% of 2z on each side gives
    // mean +- 1.1 z sigma. The 0.999 quantile of ESS samples has standard deviation
    // sqrt(0.999 * 0.001) / (phi(z) sqrt(ESS)) sigma (asymptotic variance of a sample quantile,
    // common practice); 4 of those (times 1.1 for the padding) are allowed.
    const z = normalQuantile(0.999, 0, 1);
    const quantileSd = Math.sqrt(0.999 * 0.001) / (Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI)) / Math.sqrt(effective);
    data.parameters.forEach((parameter, j) => {
      const tolerance = 4 * 1.1 * quantileSd * SIGMAS[j];
      expect(Math.abs(parameter.range[0] - (MEANS[j] - 1.1 * z * SIGMAS[j]))).toBeLessThan(tolerance);
      expect(Math.abs(parameter.range[1] - (MEANS[j] + 1.1 * z * SIGMAS[j]))).toBeLessThan(tolerance);
    });
  });

  it('gives 1-D densities that integrate to the mass in range and summaries of each column', () => {
    data.parameters.forEach((parameter, j) => {
      expect(parameter.edges).toHaveLength(41);
      expect(parameter.densities).toHaveLength(40);
      expect(parameter.edges[0]).toBe(parameter.range[0]);
      expect(parameter.edges[40]).toBe(parameter.range[1]);
      const width = (parameter.range[1] - parameter.range[0]) / 40;
      const integral = parameter.densities.reduce((a, b) => a + b, 0) * width;
      // Mass of a normal within the range, from @stdlib/stats normalCdf; importance-weighted noise
      // of a fraction near 1 is about sqrt(p(1 - p) / ESS), 4 of those allowed (plus rounding).
      const inside = normalCdf(parameter.range[1], MEANS[j], SIGMAS[j]) - normalCdf(parameter.range[0], MEANS[j], SIGMAS[j]);
      expect(Math.abs(integral - inside)).toBeLessThan(4 * Math.sqrt((inside * (1 - inside)) / effective) + 1e-12);
      expect(parameter.summary).toEqual(parameterSummary(parameterColumn(points, 3, j), weights));
    });
  });

  it('gives the pairs of the lower triangle, row by row, with their histograms and levels', () => {
    expect(data.pairs.map((pair) => [pair.xIndex, pair.yIndex])).toEqual([
      [0, 1],
      [0, 2],
      [1, 2],
    ]);
    for (const pair of data.pairs) {
      const xRange = data.parameters[pair.xIndex].range;
      const yRange = data.parameters[pair.yIndex].range;
      const histogram = weightedHistogram2d(
        parameterColumn(points, 3, pair.xIndex),
        parameterColumn(points, 3, pair.yIndex),
        weights,
        30,
        xRange,
        30,
        yRange,
      );
      expect(pair.xEdges).toEqual(Array.from(histogram.xEdges));
      expect(pair.yEdges).toEqual(Array.from(histogram.yEdges));
      expect(pair.densities).toEqual(Array.from(histogram.densities));
      expect([pair.levelEnclosing393, pair.levelEnclosing865]).toEqual(densityLevels(histogram));
      expect(pair.levelEnclosing393).toBeGreaterThan(pair.levelEnclosing865);
    }
  });

  it('honours bins, ranges and smoothing options', () => {
    const options = { bins1d: 10, bins2d: 12, ranges: [[0, 2] as const, undefined, undefined], smoothingSigmaBins: 1.5 };
    const custom = cornerData(names, units, points, weights, options);
    expect(custom.parameters[0].range).toEqual([0, 2]);
    expect(custom.parameters[1].range).toEqual(data.parameters[1].range);
    expect(custom.parameters[0].edges).toHaveLength(11);
    expect(custom.smoothingSigmaBins).toBe(1.5);
    const pair = custom.pairs[0];
    const raw = weightedHistogram2d(
      parameterColumn(points, 3, 0),
      parameterColumn(points, 3, 1),
      weights,
      12,
      [0, 2],
      12,
      custom.parameters[1].range,
    );
    const smoothed = smoothHistogram2d(raw, 1.5);
    expect(pair.densities).toEqual(Array.from(smoothed.densities));
    expect([pair.levelEnclosing393, pair.levelEnclosing865]).toEqual(densityLevels(smoothed));
  });

  it('gives a constant parameter a drawable range, and names mismatched inputs', () => {
    const flat = cornerData(['a', 'b'], ['', ''], [1, 5, 2, 5, 3, 5], [1, 1, 1]);
    expect(flat.parameters[1].range).toEqual([5 - 0.25, 5 + 0.25]);
    expect(() => cornerData(['a', 'b'], [''], [1, 2], [1])).toThrow(/units: expected 2 units, one per parameter name, found 1/);
    expect(() => cornerData(['a', 'b'], ['', ''], [1, 2, 3], [1, 1])).toThrow(/points: expected 2 rows of 2 values/);
  });
});
