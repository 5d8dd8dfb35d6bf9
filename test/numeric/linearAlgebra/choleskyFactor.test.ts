// Tests of src/numeric/linearAlgebra/choleskyFactor.ts and choleskyWithRidge.ts against ml-matrix,
// a general-purpose linear-algebra library from the npm registry.
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { choleskyFactor, choleskySolveInPlace, choleskyWithRidge } from '../../../src/numeric/index.js';

// Deterministic test data (a linear congruential generator, Numerical Recipes' constants).
function lcg(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 4294967296;
  };
}

/** A random symmetric positive-definite k x k matrix G G^T + k I, row-major. */
function spd(k: number, random: () => number): Float64Array {
  const g = Matrix.from1DArray(k, k, Array.from({ length: k * k }, () => random() - 0.5));
  const a = g.mmul(g.transpose()).add(Matrix.eye(k).mul(k * 0.1));
  return Float64Array.from(a.to1DArray());
}

describe('dense Cholesky factorisation', () => {
  it('gives ml-matrix\'s ln det and solutions to 1e-12 relative', () => {
    const random = lcg(11);
    for (const k of [1, 2, 5, 12, 30]) {
      const a = spd(k, random);
      const b = Float64Array.from({ length: k }, () => random() - 0.5);
      const reference = new CholeskyDecomposition(Matrix.from1DArray(k, k, Array.from(a)));
      const lower = reference.lowerTriangularMatrix;
      let referenceLogDet = 0;
      for (let i = 0; i < k; i++) referenceLogDet += 2 * Math.log(lower.get(i, i));
      const expected = reference.solve(Matrix.columnVector(Array.from(b))).to1DArray();
      const factor = a.slice();
      const logDet = choleskyFactor(factor, k);
      expect(Math.abs(logDet - referenceLogDet)).toBeLessThan(1e-12 * Math.max(1, Math.abs(referenceLogDet)));
      const x = b.slice();
      choleskySolveInPlace(factor, k, x);
      const scale = Math.max(...expected.map(Math.abs));
      expected.forEach((v, i) => expect(Math.abs(x[i] - v)).toBeLessThan(1e-12 * scale));
    }
  });

  it('returns NaN, without throwing, for matrices that are not positive definite', () => {
    expect(choleskyFactor(Float64Array.of(1, 2, 2, 1), 2)).toBeNaN();
    expect(choleskyFactor(Float64Array.of(0), 1)).toBeNaN();
    expect(choleskyFactor(Float64Array.of(-1, 0, 0, 1), 2)).toBeNaN();
  });

  it('with a ridge, factors a singular covariance and leaves a zero upper triangle', () => {
    // Rank-one covariance v v^T: singular, so the plain factorisation fails; the ridge version
    // must return a lower-triangular L with L L^T within the loaded ridge of the input.
    const v = [1, 2, 3];
    const covariance = Float64Array.from({ length: 9 }, (_, n) => v[Math.floor(n / 3)] * v[n % 3]);
    expect(choleskyFactor(covariance.slice(), 3)).toBeNaN();
    const factor = covariance.slice();
    choleskyWithRidge(factor, 3, new Float64Array(9));
    for (let i = 0; i < 3; i++) for (let j = i + 1; j < 3; j++) expect(factor[i * 3 + j]).toBe(0);
    const rebuilt = Matrix.from1DArray(3, 3, Array.from(factor)).mmul(Matrix.from1DArray(3, 3, Array.from(factor)).transpose());
    for (let n = 0; n < 9; n++) expect(Math.abs(rebuilt.get(Math.floor(n / 3), n % 3) - covariance[n])).toBeLessThan(1e-6);
  });
});
