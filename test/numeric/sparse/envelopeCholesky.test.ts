import { describe, expect, it } from 'vitest';
import { EnvelopeCholesky } from '../../../src/numeric/sparse/envelopeCholesky.js';
import { MultifrontalCholesky } from '../../../src/numeric/sparse/multifrontalCholesky.js';
import { SupernodeChain } from '../../../src/numeric/sparse/supernodeChain.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import { denseLogDet, denseSolve, emptyMatrix, expectSameSolutions, expectSpoiledMatricesFail, factorCase, gershgorinConditionBound, newKernel, randomVector, relativeDifference } from './factorCase.js';
import { patternOf, scipyCases } from './rcmTestTools.js';
import { accumulate, denseOf, dominantCase, gridEdges, laplacianCase, localEdges, shuffled, spdCases, uniformStream, type SparseCase } from './sparseTestMatrices.js';

// Tolerance (relative, 1e-10): Cholesky is backward stable, the computed factor being exact for
// A + E with |E| <= c n u |L| |L^T| (Higham 2002, "Accuracy and Stability of Numerical
// Algorithms", theorem 10.3; theorem number not checked, the book not reachable here), so a
// solution's normwise relative error is of order n u cond(A). The test matrices have
// cond(A) < 1e3 (Gershgorin's bound, checked below) and n <= 300, so with u = 1.1e-16 ours and
// ml-matrix's each lie within ~3e-11 of the exact solution; 1e-10 covers both. ln det =
// sum ln(pivot) is compared relative to max(1, |ln det|) at the same 1e-10 (measured
// differences are below 2e-13 absolute).
const TOLERANCE = 1e-10;

describe('EnvelopeCholesky', () => {
  it('the test matrices are well conditioned (cond < 1e3), as the tolerance assumes', () => {
    for (const c of spdCases()) expect(gershgorinConditionBound(denseOf(c)), c.name).toBeLessThan(1e3);
  });

  it('agrees to 2 n u cond(A) on a poorly conditioned grid Laplacian (cond < 8e4)', () => {
    // The 10 x 10 Laplacian + 1e-4 I: cond < 8.0001 / 1e-4 (Gershgorin), n = 100, so by the bound
    // above each solution is within n u cond ~ 9e-10 of the exact one; the two within twice that.
    const u = uniformStream(26);
    const c = laplacianCase('grid Laplacian 10 x 10 + 1e-4 I', 10, 1e-4, shuffled(100, u));
    const tolerance = 2 * c.n * 1.1e-16 * gershgorinConditionBound(denseOf(c));
    const kernel = newKernel();
    const { logDet } = factorCase(kernel, c, u);
    const reference = denseLogDet(denseOf(c));
    expect(Math.abs(logDet - reference)).toBeLessThanOrEqual(tolerance * Math.abs(reference));
    const b = randomVector(c.n, u);
    const x = new Float64Array(c.n);
    kernel.cholesky.solve(b, x);
    expect(relativeDifference(x, denseSolve(denseOf(c), b))).toBeLessThan(tolerance);
  });

  it('gives ln det A and the solution of A x = b of ml-matrix on every test pattern', () => {
    const u = uniformStream(21);
    for (const c of spdCases()) {
      const kernel = newKernel();
      const { logDet } = factorCase(kernel, c, u);
      const dense = denseOf(c);
      const reference = denseLogDet(dense);
      expect(Math.abs(logDet - reference), c.name).toBeLessThanOrEqual(TOLERANCE * Math.max(1, Math.abs(reference)));
      const b = randomVector(c.n, u);
      const x = new Float64Array(c.n);
      kernel.cholesky.solve(b, x);
      expect(relativeDifference(x, denseSolve(dense, b)), c.name).toBeLessThan(TOLERANCE);
      kernel.cholesky.solve(b, b);
      expect(Array.from(b), `${c.name}: in place`).toEqual(Array.from(x));
    }
  });

  it('factors in any ordering: the natural one gives the same ln det', () => {
    const u = uniformStream(22);
    for (const c of spdCases().slice(2, 6)) {
      const m = accumulate(new SymmetricSparseAccumulator(), c, u);
      const cholesky = new EnvelopeCholesky();
      const envelope = cholesky.analyse(m, Int32Array.from({ length: c.n }, (_, i) => i));
      expect(envelope).toBeGreaterThanOrEqual(c.n);
      const logDet = cholesky.factor(m);
      const reference = denseLogDet(denseOf(c));
      expect(Math.abs(logDet - reference), c.name).toBeLessThanOrEqual(TOLERANCE * Math.max(1, Math.abs(reference)));
    }
  });

  it("keeps exactly the profile measured by scipy's fixture script, plus the diagonal", () => {
    const cholesky = new EnvelopeCholesky();
    for (const c of scipyCases) expect(cholesky.analyse(patternOf(c), Int32Array.from(c.scipyOrder)), c.name).toBe(c.scipyProfile + c.n);
  });

  it('counts sum over columns of (envelope entries)^2 operations: n(n + 1)(2n + 1) / 6 dense (common practice), as a chain of single columns', () => {
    const u = uniformStream(27);
    const n = 23;
    const full = dominantCase('dense 23', n, Array.from({ length: n }, (_, i) => Array.from({ length: i }, (_, j) => [i, j] as [number, number])).flat(), u);
    const dense = new EnvelopeCholesky();
    dense.analyse(accumulate(new SymmetricSparseAccumulator(), full, u), Int32Array.from({ length: n }, (_, i) => i));
    expect(dense.flops).toBe((n * (n + 1) * (2 * n + 1)) / 6);
    // A chain of single-column supernodes keeps the envelope (multifrontalCholesky.test.ts checks it against scipy's profile).
    for (const c of scipyCases) {
      const order = Int32Array.from(c.scipyOrder);
      const envelope = new EnvelopeCholesky();
      envelope.analyse(patternOf(c), order);
      const chain = new MultifrontalCholesky();
      chain.analyse(patternOf(c), order, new SupernodeChain().build(c.n, 1));
      expect(envelope.flops, c.name).toBe(chain.flops);
    }
  });

  it('returns NaN without throwing for a negative pivot early or late, a zero matrix and a NaN entry', () => {
    const u = uniformStream(23);
    const c = spdCases()[3];
    const kernel = newKernel();
    factorCase(kernel, c, u);
    expectSpoiledMatricesFail(kernel.cholesky, () => accumulate(kernel.accumulator, c, u), kernel.cholesky.order.slice(0, c.n));
  });

  it('refactors new values on the same pattern without a new analysis', () => {
    const u = uniformStream(24);
    const k = 14;
    const edges = [...gridEdges(k, shuffled(k * k, u)), ...localEdges(k * k, 3, 0.2, u)];
    const cholesky = new EnvelopeCholesky();
    const accumulator = new SymmetricSparseAccumulator();
    let analysed = false;
    for (let round = 0; round < 4; round++) {
      const c: SparseCase = dominantCase(`round ${round}`, k * k, edges, u, 0.3 + round);
      const m = accumulate(accumulator, c, u);
      if (!analysed) cholesky.analyse(m, Int32Array.from(shuffled(k * k, u)));
      analysed = true;
      const reference = denseLogDet(denseOf(c));
      expect(Math.abs(cholesky.factor(m) - reference), c.name).toBeLessThanOrEqual(TOLERANCE * Math.abs(reference));
      const b = randomVector(k * k, u);
      const x = new Float64Array(k * k);
      cholesky.solve(b, x);
      expect(relativeDifference(x, denseSolve(denseOf(c), b)), c.name).toBeLessThan(TOLERANCE);
    }
  });

  it('throws when refactoring a pattern reaching outside the analysed envelope, or given a non-permutation', () => {
    const u = uniformStream(25);
    const cholesky = new EnvelopeCholesky();
    const path = dominantCase('path', 6, [[1, 0], [2, 1], [3, 2], [4, 3], [5, 4]], u);
    const natural = Int32Array.from([0, 1, 2, 3, 4, 5]);
    cholesky.analyse(accumulate(new SymmetricSparseAccumulator(), path, u), natural);
    expect(cholesky.envelopeSize).toBe(11);
    const wider = dominantCase('wider', 6, [[1, 0], [2, 1], [3, 2], [4, 3], [5, 4], [5, 0]], u);
    expect(() => cholesky.factor(accumulate(new SymmetricSparseAccumulator(), wider, u))).toThrow(/outside the analysed envelope/);
    expect(() => cholesky.analyse(accumulate(new SymmetricSparseAccumulator(), path, u), Int32Array.from([0, 1, 2, 3, 3, 5]))).toThrow(RangeError);
  });

  it('gives the same results when one kernel is reused across sizes (grow and shrink) as fresh kernels', () => {
    const cases = spdCases();
    const reused = newKernel();
    for (const c of [cases[6], cases[0], cases[4], cases[9], cases[7], cases[1], cases[8]]) {
      const a = factorCase(reused, c, uniformStream(c.n));
      const fresh = newKernel();
      const b = factorCase(fresh, c, uniformStream(c.n));
      expect(a.logDet, c.name).toBe(b.logDet);
      expectSameSolutions(reused.cholesky, fresh.cholesky, c.n, c.name);
    }
  });

  it('keeps its buffers once they have grown: a smaller call after a larger one allocates none', () => {
    // The typed arrays a kernel exposes are the same objects before and after a smaller call,
    // so the steady state of a likelihood (sizes varying below the largest) does not allocate.
    const cases = spdCases();
    const kernel = newKernel();
    factorCase(kernel, cases[7], uniformStream(1));
    const matrix = kernel.accumulator.compress();
    const before = [kernel.cholesky.lower, kernel.cholesky.first, kernel.cholesky.rowStart, kernel.cholesky.order, matrix.column, matrix.value, matrix.rowStart];
    for (const c of [cases[4], cases[2], cases[8]]) {
      const { matrix: m } = factorCase(kernel, c, uniformStream(2));
      const after = [kernel.cholesky.lower, kernel.cholesky.first, kernel.cholesky.rowStart, kernel.cholesky.order, m.column, m.value, m.rowStart];
      after.forEach((buffer, t) => expect(buffer === before[t], `${c.name}: buffer ${t}`).toBe(true));
    }
  });

  it('handles an empty matrix: ln det 0', () => {
    const m = emptyMatrix();
    const cholesky = new EnvelopeCholesky();
    expect(cholesky.analyse(m, new Int32Array(0))).toBe(0);
    expect(cholesky.factor(m)).toBe(0);
  });
});
