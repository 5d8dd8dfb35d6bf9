import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { insertionRankTest } from '../../../src/sampling/nested/insertionRank.js';
import { kolmogorovSmirnovPValue, kolmogorovSmirnovUniform } from '../../../src/numeric/statistics/kolmogorovSmirnov.js';
import type { NestedProblem } from '../../../src/sampling/nested/nestedProblem.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';

const fixture = JSON.parse(readFileSync(new URL('./fixtures/kolmogorov_pvalues.json', import.meta.url), 'utf8')) as {
  rows: Array<{ n: number; statistic: number; pValue: number }>;
};

describe('Kolmogorov-Smirnov p-value', () => {
  it('matches the exact finite-n distribution of scipy.stats.kstwo (fixtures/make_kolmogorov_pvalues.py)', () => {
    // Stephens' (1970) corrected asymptotic form is an approximation: measured against the exact
    // distribution for n = 50..5000 its worst absolute error is 0.012 (near p = 0.9, n = 50) and its
    // worst relative error 5.4% (p = 1e-5, n = 50). The bounds below are those worst cases rounded up.
    for (const row of fixture.rows) {
      const p = kolmogorovSmirnovPValue(row.statistic, row.n);
      expect(Math.abs(p - row.pValue)).toBeLessThan(0.015);
      if (row.pValue <= 0.05) expect(Math.abs(p / row.pValue - 1)).toBeLessThan(0.06);
    }
  });

  it('computes D_n as the largest gap between the empirical and uniform distribution functions', () => {
    // Worked by hand: sorted {0.1, 0.4, 0.9}: gaps 1/3 - 0.1, 0.4 - 1/3, 2/3 - 0.4, 0.9 - 2/3, 1 - 0.9.
    expect(kolmogorovSmirnovUniform(Float64Array.from([0.9, 0.1, 0.4]))).toBeCloseTo(2 / 3 - 0.4, 15);
  });

  it('insertionRankTest: uniform ranks pass, ranks piled at the top fail', () => {
    const stream = SeededStream.fromSeed(3);
    const count = 4000;
    const ranks = new Float64Array(count);
    const skewed = new Float64Array(count);
    const others = new Float64Array(count).fill(99);
    for (let i = 0; i < count; i++) {
      ranks[i] = stream.integer(100);
      skewed[i] = Math.floor(100 * Math.sqrt(stream.uniform()));
    }
    expect(insertionRankTest(ranks, others, count, 1).biased).toBe(false);
    expect(insertionRankTest(skewed, others, count, 1).pValue).toBeLessThan(1e-10);
  });
});

// A normalised 2-D Gaussian in the unit square (sigma 0.08, 6 sigma from the edges).
const gaussian: NestedProblem = {
  dim: 2,
  physicalDim: 2,
  transform(unit, out) {
    out.set(unit);
  },
  logLikelihood(points, count) {
    const lnL = new Float64Array(count);
    for (let n = 0; n < count; n++) {
      const x = (points[2 * n] - 0.5) / 0.08;
      const y = (points[2 * n + 1] - 0.5) / 0.08;
      lnL[n] = -0.5 * (x * x + y * y);
    }
    return lnL;
  },
};

// The bound is the enclosing ellipsoid grown by its bootstrap expansion, so it exceeds the contour
// by a margin: shrinking it to a quarter of its volume (half its width in 2-D) is needed to cut
// well into the contour.
describe('insertion-rank check of a run (Fowlie, Handley & Su 2020)', () => {
  it('is not flagged for a correct sampler', async () => {
    const result = await runNested(gaussian, { livePoints: 200, seed: 2, method: 'ellipsoids', evidence: 'nested' });
    expect(result.insertionRank.ranks).toBe(result.iterations);
    expect(result.insertionRank.pValue).toBeGreaterThan(0.01);
    expect(result.insertionRank.biased).toBe(false);
  });

  it('is flagged for a sampler drawing from ellipsoids shrunk to a quarter of their volume', async () => {
    const result = await runNested(gaussian, { livePoints: 200, seed: 2, method: 'ellipsoids', evidence: 'nested', boundVolumeFactorForTesting: 0.25 });
    expect(result.insertionRank.pValue).toBeLessThan(1e-6);
    expect(result.insertionRank.biased).toBe(true);
  });
});
