import { describe, expect, it } from 'vitest';
import { choleskyFactor } from '../../../src/numeric/linearAlgebra/choleskyFactor.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';
import { shrunkCovariance } from '../../../src/numeric/statistics/shrunkCovariance.js';

/** Rows drawn from N(0, S) with S = L L^T for the given lower factor. */
function gaussianRows(lower: number[][], count: number, seed: number): Float64Array {
  const dim = lower.length;
  const stream = SeededStream.fromSeed(seed);
  const rows = new Float64Array(count * dim);
  const z = new Float64Array(dim);
  for (let n = 0; n < count; n++) {
    for (let i = 0; i < dim; i++) z[i] = stream.normal();
    for (let i = 0; i < dim; i++) for (let j = 0; j <= i; j++) rows[n * dim + i] += lower[i][j] * z[j];
  }
  return rows;
}

function meanOf(rows: Float64Array, count: number, dim: number): Float64Array {
  const mean = new Float64Array(dim);
  for (let n = 0; n < count; n++) for (let i = 0; i < dim; i++) mean[i] += rows[n * dim + i] / count;
  return mean;
}

describe('covariance with shrunk correlations (Schafer & Strimmer 2005, target D)', () => {
  it('keeps a strong correlation when there are many points', () => {
    // S = [[1, 0.8], [0.8, 1]]; with 20,000 points the sample correlation's standard error is
    // (1 - 0.64)/sqrt(n) = 0.0025 and lambda is of order 1/n: 0.01 is four errors.
    const rows = gaussianRows([[1, 0], [0.8, 0.6]], 20000, 5);
    const weights = new Float64Array(20000).fill(1);
    const c = shrunkCovariance(rows, weights, 20000, 2, meanOf(rows, 20000, 2), 20000);
    expect(c[1] / Math.sqrt(c[0] * c[3])).toBeGreaterThan(0.79);
    expect(c[1]).toBe(c[2]);
  });

  it('shrinks toward the diagonal and stays positive definite with fewer points than dimensions', () => {
    // 5 points in 12 dimensions: the sample covariance has rank 4 and no Cholesky factor; the
    // shrunk one keeps the sample variances on its diagonal and factorises.
    const dim = 12;
    const lower = Array.from({ length: dim }, (_, i) => Array.from({ length: dim }, (_, j) => (i === j ? 1 : 0)));
    const rows = gaussianRows(lower, 5, 6);
    const weights = new Float64Array(5).fill(1);
    const mean = meanOf(rows, 5, dim);
    const c = shrunkCovariance(rows, weights, 5, dim, mean, 5);
    for (let a = 0; a < dim; a++) {
      let variance = 0;
      for (let n = 0; n < 5; n++) variance += (rows[n * dim + a] - mean[a]) ** 2 / 5;
      expect(c[a * dim + a]).toBeCloseTo(variance, 12);
    }
    expect(Number.isNaN(choleskyFactor(Float64Array.from(c), dim))).toBe(false);
  });

  it('weights rows: a weight of 2 counts as the row twice', () => {
    const rows = gaussianRows([[1, 0, 0], [0.3, 1, 0], [0.1, 0.2, 1]], 40, 7);
    const doubled = new Float64Array(41 * 3);
    doubled.set(rows);
    doubled.set(rows.subarray(0, 3), 40 * 3);
    const weights = new Float64Array(40).fill(1);
    weights[0] = 2;
    const mean = new Float64Array(3);
    for (let n = 0; n < 40; n++) for (let i = 0; i < 3; i++) mean[i] += (weights[n] * rows[n * 3 + i]) / 41;
    const weighted = shrunkCovariance(rows, weights, 40, 3, mean, 41);
    const copies = shrunkCovariance(doubled, new Float64Array(41).fill(1), 41, 3, mean, 41);
    // The variances and sample correlations agree exactly; lambda's spread term counts a doubled
    // row's weight squared (it is one point, not two), so the off-diagonals may differ slightly.
    for (let a = 0; a < 3; a++) expect(weighted[a * 3 + a]).toBeCloseTo(copies[a * 3 + a], 12);
  });
});
