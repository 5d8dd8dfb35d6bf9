import { inverse, type Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { MultifrontalCholesky } from '../../../src/numeric/sparse/multifrontalCholesky.js';
import { ReverseCuthillMcKee } from '../../../src/numeric/sparse/reverseCuthillMcKee.js';
import { SupernodeChain } from '../../../src/numeric/sparse/supernodeChain.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import { relativeDifference } from './factorCase.js';
import { factorMultifrontal, newMultifrontalKernel } from './multifrontalCase.js';
import { accumulate, denseOf, denseTail, geometricCases, spdCases, uniformStream } from './sparseTestMatrices.js';

// Reference: the diagonal of ml-matrix's inverse() of the dense matrix (LU with pivoting).
// Tolerance 1e-10 relative, for the reason given in envelopeInverseDiagonal.test.ts: each
// column of A^-1 solves a system with cond(A) < 1e3 and n <= 302, so both computations lie
// within ~3e-11 of the exact diagonal, whose entries are of comparable size.
const TOLERANCE = 1e-10;

function denseInverseDiagonal(a: Matrix): number[] {
  const z = inverse(a);
  return Array.from({ length: a.rows }, (_, i) => z.get(i, i));
}

describe('supernodalInverseDiagonal (MultifrontalCholesky.inverseDiagonal)', () => {
  it('equals the diagonal of the dense inverse on every test pattern, in nested-dissection order', () => {
    const u = uniformStream(71);
    for (const leafSize of [4, 64]) {
      for (const [c, points] of [...spdCases().map((s) => [s, null] as const), ...geometricCases().map((g) => [g.matrix, g.points] as const)]) {
        const kernel = newMultifrontalKernel(leafSize);
        factorMultifrontal(kernel, c, u, points);
        const diagonal = new Float64Array(c.n);
        kernel.cholesky.inverseDiagonal(diagonal);
        expect(relativeDifference(diagonal, denseInverseDiagonal(denseOf(c))), `${c.name}, leaves of ${leafSize}`).toBeLessThan(TOLERANCE);
      }
    }
  });

  it('works over a chain of blocks in reverse Cuthill-McKee order too', () => {
    const u = uniformStream(72);
    for (const c of [spdCases()[4], spdCases()[7], geometricCases()[0].matrix]) {
      const m = accumulate(new SymmetricSparseAccumulator(), c, u);
      const order = new ReverseCuthillMcKee().order(m, new Int32Array(c.n), denseTail(c));
      const cholesky = new MultifrontalCholesky();
      cholesky.analyse(m, order, new SupernodeChain().build(c.n, 16));
      cholesky.factor(m);
      const diagonal = new Float64Array(c.n);
      cholesky.inverseDiagonal(diagonal);
      expect(relativeDifference(diagonal, denseInverseDiagonal(denseOf(c))), c.name).toBeLessThan(TOLERANCE);
    }
  });

  it('throws without a successful factor, or with too short an output', () => {
    const c = spdCases()[2];
    const kernel = newMultifrontalKernel();
    const { matrix } = factorMultifrontal(kernel, c, uniformStream(73));
    expect(() => kernel.cholesky.inverseDiagonal(new Float64Array(c.n - 1))).toThrow(RangeError);
    matrix.value.fill(0, 0, matrix.rowStart[matrix.size]);
    expect(kernel.cholesky.factor(matrix)).toBeNaN();
    expect(() => kernel.cholesky.inverseDiagonal(new Float64Array(c.n))).toThrow();
  });
});
