import { inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { DenseCholesky } from '../../../src/numeric/sparse/denseCholesky.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import { denseLogDet, denseSolve, emptyMatrix, expectSpoiledMatricesFail, gershgorinConditionBound, randomVector, relativeDifference } from './factorCase.js';
import { accumulate, denseOf, dominantCase, localEdges, spdCases, uniformStream } from './sparseTestMatrices.js';

// Reference: ml-matrix's CholeskyDecomposition and inverse of the dense matrix (a general-purpose
// library from the npm registry). Tolerance 1e-10 relative, as in envelopeCholesky.test.ts:
// Cholesky is backward stable, so with cond(A) < 1e3 (Gershgorin's bound, checked below) and
// n <= 300 each solution lies within ~3e-11 of the exact one.
const TOLERANCE = 1e-10;

describe('DenseCholesky (one dense front)', () => {
  it('gives the ln det, solution and diagonal of the inverse of ml-matrix on the factorisation fixtures', () => {
    // One instance for every case, so the array is reused across sizes (1 to 300, some not a
    // multiple of the 4 x 4 tiles or the 64-column blocks).
    const cholesky = new DenseCholesky();
    const uniform = uniformStream(5);
    for (const c of spdCases()) {
      const dense = denseOf(c);
      expect(gershgorinConditionBound(dense), c.name).toBeLessThan(1e3);
      const matrix = accumulate(new SymmetricSparseAccumulator(), c, uniform);
      const logDet = cholesky.factor(matrix);
      const reference = denseLogDet(dense);
      expect(Math.abs(logDet - reference), `${c.name}: ln det`).toBeLessThanOrEqual(TOLERANCE * Math.max(1, Math.abs(reference)));
      expect(cholesky.isFactored).toBe(true);
      const b = randomVector(c.n, uniform);
      const x = new Float64Array(c.n);
      cholesky.solve(b, x);
      expect(relativeDifference(x, denseSolve(dense, b)), `${c.name}: solution`).toBeLessThanOrEqual(TOLERANCE);
      if (c.n <= 150) {
        const variance = new Float64Array(c.n);
        cholesky.inverseDiagonal(variance);
        const expected = inverse(dense);
        for (let i = 0; i < c.n; i++) expect(Math.abs(variance[i] - expected.get(i, i)), `${c.name}: (A^-1)_${i}${i}`).toBeLessThanOrEqual(TOLERANCE * expected.get(i, i));
      }
    }
  });

  it('solves in place (x may be b) with the result of a separate output', () => {
    const c = dominantCase('local', 70, localEdges(70, 9, 0.6, uniformStream(3)), uniformStream(4));
    const cholesky = new DenseCholesky();
    cholesky.factor(accumulate(new SymmetricSparseAccumulator(), c, uniformStream(6)));
    const b = randomVector(70, uniformStream(7));
    const x = new Float64Array(70);
    cholesky.solve(b, x);
    const same = Float64Array.from(b);
    cholesky.solve(same, same);
    expect(Array.from(same)).toEqual(Array.from(x));
  });

  it('returns NaN for a matrix that is not positive definite, keeps no factor and refuses to solve', () => {
    const c = dominantCase('local', 90, localEdges(90, 6, 0.5, uniformStream(8)), uniformStream(9));
    const fresh = () => accumulate(new SymmetricSparseAccumulator(), c, uniformStream(10));
    expectSpoiledMatricesFail(new DenseCholesky(), fresh, Int32Array.from({ length: 90 }, (_, i) => i));
    expect(() => new DenseCholesky().inverseDiagonal(new Float64Array(1))).toThrow();
  });

  it('takes the 0 x 0 matrix (ln det 0)', () => {
    const cholesky = new DenseCholesky();
    expect(cholesky.factor(emptyMatrix())).toBe(0);
    expect(cholesky.size).toBe(0);
  });
});
