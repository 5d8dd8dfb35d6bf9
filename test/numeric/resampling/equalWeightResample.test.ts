// Tests of src/numeric/resampling/equalWeightResample.ts and src/numeric/statistics/kishEffectiveSampleSize.ts.
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { equalWeightResample, kishEffectiveSampleSize } from '../../../src/numeric/index.js';

// Seven rows of dim 2 (row i holds [i, 10 i]) with uneven weights, one of them zero.
const WEIGHTS = [0.05, 0.3, 0, 0.125, 0.2, 0.3, 0.025];
const POINTS = Float64Array.from(WEIGHTS.flatMap((_, i) => [i, 10 * i]));

function copyCounts(sourceRows: Uint32Array): number[] {
  const counts = new Array<number>(WEIGHTS.length).fill(0);
  for (const row of sourceRows) counts[row]++;
  return counts;
}

describe('kishEffectiveSampleSize', () => {
  it('is n for equal weights and counts only the weighted rows (Kish 1965)', () => {
    expect(kishEffectiveSampleSize(new Float64Array(40).fill(0.3))).toBeCloseTo(40, 12);
    expect(kishEffectiveSampleSize([0, 2, 0, 2])).toBe(2);
    // (1 + 3)^2 / (1 + 9) = 1.6.
    expect(kishEffectiveSampleSize([1, 3])).toBeCloseTo(1.6, 14);
  });
});

describe('equalWeightResample', () => {
  it('is deterministic for a seed and copies whole rows', () => {
    const a = equalWeightResample(POINTS, 2, WEIGHTS, 42, 25);
    const b = equalWeightResample(POINTS, 2, WEIGHTS, 42, 25);
    expect(a.points).toEqual(b.points);
    expect(a.sourceRows).toEqual(b.sourceRows);
    const others = [1, 2, 3, 4, 5].map((seed) => Array.from(equalWeightResample(POINTS, 2, WEIGHTS, seed, 25).sourceRows).join());
    expect(new Set(others).size).toBeGreaterThan(1);
    for (let k = 0; k < a.count; k++) {
      const row = a.sourceRows[k];
      expect([a.points[2 * k], a.points[2 * k + 1]]).toEqual([row, 10 * row]);
      if (k > 0) expect(row).toBeGreaterThanOrEqual(a.sourceRows[k - 1]);
    }
  });

  it('copies each row floor(n w) or ceil(n w) times (property of systematic resampling)', () => {
    // Kitagawa 1996: the comb (k + U) / n has one tooth in every interval of length 1/n, so a row
    // whose weight step has length w gets floor(n w) or ceil(n w) teeth.
    for (let seed = 1; seed <= 200; seed++) {
      const n = 13 + (seed % 17);
      const counts = copyCounts(equalWeightResample(POINTS, 2, WEIGHTS, seed, n).sourceRows);
      counts.forEach((count, i) => {
        expect(count).toBeGreaterThanOrEqual(Math.floor(n * WEIGHTS[i] - 1e-12));
        expect(count).toBeLessThanOrEqual(Math.ceil(n * WEIGHTS[i] + 1e-12));
      });
      expect(counts[2]).toBe(0);
    }
  });

  it('copies each row n w times on average over seeds (unbiased)', () => {
    // Over S seeds a row's count is floor(n w) + a Bernoulli draw of probability frac(n w), so its
    // mean has standard deviation sqrt(f (1 - f) / S); 4 of those allowed.
    const n = 17;
    const seeds = 3000;
    const sums = new Array<number>(WEIGHTS.length).fill(0);
    for (let seed = 1; seed <= seeds; seed++) {
      copyCounts(equalWeightResample(POINTS, 2, WEIGHTS, seed, n).sourceRows).forEach((count, i) => (sums[i] += count));
    }
    sums.forEach((sum, i) => {
      const expected = n * WEIGHTS[i];
      const fraction = expected - Math.floor(expected);
      const sd = Math.sqrt((fraction * (1 - fraction)) / seeds);
      expect(Math.abs(sum / seeds - expected)).toBeLessThanOrEqual(4 * sd + 1e-12);
    });
  });

  it('takes the Kish effective sample size as the default count and checks its inputs', () => {
    // Kish ESS of WEIGHTS: 1 / sum w^2 = 1 / 0.228... = 4.38, so 4 rows.
    expect(equalWeightResample(POINTS, 2, WEIGHTS, 3).count).toBe(Math.floor(1 / WEIGHTS.reduce((s, w) => s + w * w, 0)));
    expect(() => equalWeightResample(POINTS, 2, WEIGHTS, 0)).toThrow(/resampling seed: expected an integer from 1 to 4294967295, found 0/);
    expect(() => equalWeightResample(POINTS, 3, WEIGHTS, 1)).toThrow(InputError);
    expect(() => equalWeightResample(POINTS, 2, WEIGHTS.map((w) => -w), 1)).toThrow(/weight 0: expected a finite number >= 0/);
  });
});
