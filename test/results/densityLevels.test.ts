// Tests of src/results/densityLevels.ts and src/results/smoothHistogram2d.ts.
import erf from '@stdlib/math/base/special/erf';
import normal from '@stdlib/random/base/normal';
import { describe, expect, it } from 'vitest';
import {
  densityLevels,
  MASS_ONE_SIGMA_2D,
  MASS_TWO_SIGMA_2D,
  smoothHistogram2d,
  weightedHistogram2d,
  type Histogram2d,
} from '../../src/results/index.js';

const MASSES = [MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D];

// A correlated 2-D Gaussian: sigma_x = 1, sigma_y = 2, correlation 0.7, drawn by the Cholesky
// factor x = z1, y = 2 (0.7 z1 + sqrt(1 - 0.49) z2) (common practice).
function correlatedGaussian(count: number, seed: number): { x: Float64Array; y: Float64Array } {
  const draw = normal.factory(0, 1, { seed });
  const x = new Float64Array(count);
  const y = new Float64Array(count);
  const mix = Math.sqrt(1 - 0.49);
  for (let i = 0; i < count; i++) {
    const z1 = draw();
    const z2 = draw();
    x[i] = z1;
    y[i] = 2 * (0.7 * z1 + mix * z2);
  }
  return { x, y };
}

/** Mass of `histogram` (fraction of the total) in the cells whose `selector` density is >= level. */
function massAtOrAbove(histogram: Histogram2d, selector: Float64Array, level: number): number {
  const cellArea =
    ((histogram.xEdges[histogram.xBinCount] - histogram.xEdges[0]) / histogram.xBinCount) *
    ((histogram.yEdges[histogram.yBinCount] - histogram.yEdges[0]) / histogram.yBinCount);
  let sum = 0;
  for (let cell = 0; cell < selector.length; cell++) if (selector[cell] >= level) sum += histogram.densities[cell];
  return sum * cellArea;
}

describe('densityLevels', () => {
  it('takes the density of the cell where the running mass first reaches m (worked example)', () => {
    // Weights 1, 1, 2, 4 in four cells of area 1: densities 1/8, 1/8, 2/8, 4/8 (exact in binary).
    // Sorted masses 0.5, 0.25, 0.125, 0.125: m = 0.5 is reached at the first cell, 0.6 and 0.75 at
    // the second, 0.76 only at the tied pair of 1/8 (whose region then holds all the mass).
    const histogram = weightedHistogram2d([0.5, 1.5, 0.5, 1.5], [0.5, 0.5, 1.5, 1.5], [1, 1, 2, 4], 2, [0, 2], 2, [0, 2]);
    expect(Array.from(histogram.densities)).toEqual([0.125, 0.125, 0.25, 0.5]);
    expect(densityLevels(histogram, { masses: [0, 0.5, 0.6, 0.75, 0.76, 1] })).toEqual([0.5, 0.5, 0.25, 0.25, 0.125, 0.125]);
  });

  it('the 39.3% and 86.5% regions of a correlated Gaussian hold that mass of fresh samples', () => {
    // Levels from 2,000,000 samples on 100 x 100 bins over +-5 sigma; regions checked on 200,000
    // fresh ones. Each region's fraction of either set is binomial, so |fresh - m| is allowed 4
    // sigma of the two sets' binomial noise combined, plus the step by which the cells at the level
    // overshoot m on the first set (measured below, and bounded by the mass of the cells at the
    // level). With fewer samples per cell the selection of cells by their own noise biases the
    // check (seen at 200,000 first-set samples on 120 bins), hence the large first set.
    const firstCount = 2_000_000;
    const freshCount = 200_000;
    const first = correlatedGaussian(firstCount, 11);
    const fresh = correlatedGaussian(freshCount, 12);
    const firstHistogram = weightedHistogram2d(first.x, first.y, new Float64Array(firstCount).fill(1), 100, [-5, 5], 100, [-10, 10]);
    const freshHistogram = weightedHistogram2d(fresh.x, fresh.y, new Float64Array(freshCount).fill(1), 100, [-5, 5], 100, [-10, 10]);
    const levels = densityLevels(firstHistogram);
    const cellArea = 0.1 * 0.2;
    MASSES.forEach((mass, k) => {
      const onFirst = massAtOrAbove(firstHistogram, firstHistogram.densities, levels[k]);
      let cellsAtLevel = 0;
      for (const density of firstHistogram.densities) if (density === levels[k]) cellsAtLevel++;
      const overshoot = (onFirst - mass * firstHistogram.enclosedMass) / firstHistogram.enclosedMass;
      expect(overshoot).toBeGreaterThanOrEqual(0);
      expect(overshoot).toBeLessThanOrEqual(cellsAtLevel * levels[k] * cellArea);
      const onFresh = massAtOrAbove(freshHistogram, firstHistogram.densities, levels[k]);
      const sigma = Math.sqrt(mass * (1 - mass) * (1 / firstCount + 1 / freshCount));
      expect(Math.abs(onFresh - mass)).toBeLessThan(4 * sigma + overshoot);
    });
  });
});

describe('smoothHistogram2d', () => {
  // An exact "histogram" of an isotropic Gaussian of sigma = 20 bins on 200 x 200 unit bins: each
  // cell holds its exact probability (products of erf differences, @stdlib/math erf).
  const sigma = 20;
  const bins = 200;
  function exactGaussianHistogram(): Histogram2d {
    const edges = Float64Array.from({ length: bins + 1 }, (_, i) => i - bins / 2);
    const axis = new Float64Array(bins);
    for (let i = 0; i < bins; i++) axis[i] = 0.5 * (erf(edges[i + 1] / (sigma * Math.SQRT2)) - erf(edges[i] / (sigma * Math.SQRT2)));
    const densities = new Float64Array(bins * bins);
    for (let iy = 0; iy < bins; iy++) for (let ix = 0; ix < bins; ix++) densities[iy * bins + ix] = axis[ix] * axis[iy];
    return { xEdges: edges, yEdges: edges, xBinCount: bins, yBinCount: bins, densities, enclosedMass: 1 };
  }

  it('widens a Gaussian by the kernel: regions hold 1 - (1 - m)^(sigma\'^2 / sigma^2) of the true mass', () => {
    // Smoothing by s bins turns the Gaussian of variance sigma^2 (+ 1/12 bin^2 from averaging over a
    // cell) into one of variance sigma'^2 = sigma^2 + 1/12 + s^2 (variances add under convolution),
    // whose m-region is the circle r^2 = -2 sigma'^2 ln(1 - m); under the true Gaussian it holds
    // 1 - (1 - m)^(sigma'^2 / sigma^2) (common practice). The region is a set of whole cells, taken
    // or left by symmetric groups of up to 8 cells of equal density, so it may overshoot by the
    // mass of the group at the level; 2e-4 more allows for the rest of the lattice error and the
    // kernel's cut at 4 s (which lowers its variance by 0.1%, moving the mass by ~3e-5).
    // (Measured: held - expected = -6e-5 at both masses.)
    const histogram = exactGaussianHistogram();
    const s = 6;
    const smoothed = smoothHistogram2d(histogram, s);
    const levels = densityLevels(histogram, { smoothingSigmaBins: s });
    MASSES.forEach((mass, k) => {
      const held = massAtOrAbove(histogram, smoothed.densities, levels[k]);
      const expected = 1 - Math.pow(1 - mass, (sigma * sigma + 1 / 12 + s * s) / (sigma * sigma));
      let groupAtLevel = 0;
      for (let cell = 0; cell < smoothed.densities.length; cell++) {
        if (Math.abs(smoothed.densities[cell] - levels[k]) <= 1e-9 * levels[k]) groupAtLevel += histogram.densities[cell];
      }
      const tolerance = groupAtLevel + 2e-4;
      expect(Math.abs(held - expected)).toBeLessThan(tolerance);
      // The check can tell smoothing from none: the widening moves the mass by far more than that.
      expect(expected - mass).toBeGreaterThan(10 * tolerance);
    });
  });

  it('is off by default, keeps the mass away from the edges, and rejects a bad width', () => {
    const histogram = exactGaussianHistogram();
    expect(densityLevels(histogram)).toEqual(densityLevels(histogram, { smoothingSigmaBins: 0 }));
    expect(densityLevels(histogram)).not.toEqual(densityLevels(histogram, { smoothingSigmaBins: 2 }));
    // The kernel is normalised to sum 1 and the Gaussian's mass beyond +-5 sigma is ~6e-7, so
    // smoothing by 2 bins keeps the total to ~1e-6.
    const smoothed = smoothHistogram2d(histogram, 2);
    const before = histogram.densities.reduce((a, b) => a + b, 0);
    const after = smoothed.densities.reduce((a, b) => a + b, 0);
    expect(Math.abs(after - before)).toBeLessThan(1e-5);
    expect(smoothed.enclosedMass).toBeCloseTo(after / before, 12);
    expect(() => smoothHistogram2d(histogram, -1)).toThrow(/smoothing sigma in bins: expected a finite number >= 0, found -1/);
  });
});
