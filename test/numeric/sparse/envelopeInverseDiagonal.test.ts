import { inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { EnvelopeCholesky } from '../../../src/numeric/sparse/envelopeCholesky.js';
import { envelopeInverseDiagonal } from '../../../src/numeric/sparse/envelopeInverseDiagonal.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import { factorCase, newKernel, relativeDifference } from './factorCase.js';
import { accumulate, denseOf, spdCases, uniformStream } from './sparseTestMatrices.js';

// Reference: the diagonal of ml-matrix's inverse() of the dense matrix (LU with pivoting).
// Tolerance 1e-10 relative, for the reason given in envelopeCholesky.test.ts: each column of
// A^-1 is the solution of a system with cond(A) < 1e3 and n <= 300, so both computations lie
// within ~3e-11 of the exact diagonal, whose entries are of comparable size (1 / max a_ii to
// 1 / min eigenvalue).
const TOLERANCE = 1e-10;

function denseInverseDiagonal(c: Parameters<typeof denseOf>[0]): number[] {
  const z = inverse(denseOf(c));
  return Array.from({ length: c.n }, (_, i) => z.get(i, i));
}

describe('envelopeInverseDiagonal', () => {
  it('equals the diagonal of the dense inverse on every test pattern', () => {
    const u = uniformStream(31);
    for (const c of spdCases()) {
      const kernel = newKernel();
      factorCase(kernel, c, u);
      const diagonal = new Float64Array(c.n);
      envelopeInverseDiagonal(kernel.cholesky, diagonal);
      expect(relativeDifference(diagonal, denseInverseDiagonal(c)), c.name).toBeLessThan(TOLERANCE);
    }
  });

  it('works in a poor ordering too (the natural one, wide envelope)', () => {
    const u = uniformStream(32);
    const c = spdCases()[3];
    const m = accumulate(new SymmetricSparseAccumulator(), c, u);
    const cholesky = new EnvelopeCholesky();
    cholesky.analyse(m, Int32Array.from({ length: c.n }, (_, i) => i));
    cholesky.factor(m);
    const diagonal = new Float64Array(c.n);
    envelopeInverseDiagonal(cholesky, diagonal);
    expect(relativeDifference(diagonal, denseInverseDiagonal(c))).toBeLessThan(TOLERANCE);
  });

  it('throws without a successful factor', () => {
    const c = spdCases()[2];
    const kernel = newKernel();
    const { matrix } = factorCase(kernel, c, uniformStream(33));
    matrix.value.fill(0, 0, matrix.rowStart[matrix.size]);
    expect(kernel.cholesky.factor(matrix)).toBeNaN();
    expect(() => envelopeInverseDiagonal(kernel.cholesky, new Float64Array(c.n))).toThrow();
  });
});
