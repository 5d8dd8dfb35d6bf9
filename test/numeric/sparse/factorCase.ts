// Runs the sparse pipeline (accumulate, order, analyse, factor) on a test case, and the dense
// reference (ml-matrix's Cholesky decomposition) beside it.
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { expect } from 'vitest';
import { EnvelopeCholesky } from '../../../src/numeric/sparse/envelopeCholesky.js';
import { ReverseCuthillMcKee } from '../../../src/numeric/sparse/reverseCuthillMcKee.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../../../src/numeric/sparse/symmetricCsr.js';
import { accumulate, denseTail, uniformStream, type SparseCase } from './sparseTestMatrices.js';

/** The instances one pipeline uses; pass the same one to several calls to test reuse. */
export interface SparseKernel {
  readonly accumulator: SymmetricSparseAccumulator;
  readonly ordering: ReverseCuthillMcKee;
  readonly cholesky: EnvelopeCholesky;
}

export function newKernel(): SparseKernel {
  return { accumulator: new SymmetricSparseAccumulator(), ordering: new ReverseCuthillMcKee(), cholesky: new EnvelopeCholesky() };
}

/**
 * Accumulates, orders (cases whose name ends in "dense" keep their last rows last), analyses
 * and factors `c`; returns the compressed matrix and ln det.
 */
export function factorCase(kernel: SparseKernel, c: SparseCase, uniform: () => number): { matrix: SymmetricCsr; logDet: number } {
  const matrix = accumulate(kernel.accumulator, c, uniform);
  const order = kernel.ordering.order(matrix, new Int32Array(c.n), denseTail(c));
  kernel.cholesky.analyse(matrix, order);
  return { matrix, logDet: kernel.cholesky.factor(matrix) };
}

/** ln det of a dense SPD matrix, 2 sum ln L_ii, from ml-matrix's Cholesky decomposition. */
export function denseLogDet(a: Matrix): number {
  const l = new CholeskyDecomposition(a).lowerTriangularMatrix;
  let s = 0;
  for (let i = 0; i < a.rows; i++) s += 2 * Math.log(l.get(i, i));
  return s;
}

/** Largest |x - y| over the largest |y|: the normwise relative difference. */
export function relativeDifference(x: ArrayLike<number>, y: ArrayLike<number>): number {
  let difference = 0;
  let scale = 0;
  for (let i = 0; i < y.length; i++) {
    difference = Math.max(difference, Math.abs(x[i] - y[i]));
    scale = Math.max(scale, Math.abs(y[i]));
  }
  return difference / scale;
}

/**
 * An upper bound on the condition number of a symmetric matrix whose Gershgorin discs all lie
 * right of 0 (Gershgorin 1931): max(a_ii + r_i) / min(a_ii - r_i), r_i = sum_j!=i |a_ij|.
 */
export function gershgorinConditionBound(a: Matrix): number {
  let low = Number.POSITIVE_INFINITY;
  let high = 0;
  for (let i = 0; i < a.rows; i++) {
    let r = 0;
    for (let j = 0; j < a.columns; j++) if (j !== i) r += Math.abs(a.get(i, j));
    low = Math.min(low, a.get(i, i) - r);
    high = Math.max(high, a.get(i, i) + r);
  }
  return low > 0 ? high / low : Number.POSITIVE_INFINITY;
}

export function randomVector(n: number, uniform: () => number): Float64Array {
  return Float64Array.from({ length: n }, () => 2 * uniform() - 1);
}

export function denseSolve(a: Matrix, b: Float64Array): number[] {
  return new CholeskyDecomposition(a).solve(Matrix.columnVector(Array.from(b))).getColumn(0);
}

/** Sets the stored diagonal entry of original row i to `value`. */
export function setDiagonal(m: SymmetricCsr, i: number, value: number): void {
  const p = m.rowStart[i + 1] - 1;
  if (m.column[p] !== i) throw new Error(`row ${i} stores no diagonal`);
  m.value[p] = value;
}

/** The dense symmetric matrix of a compressed lower triangle. */
export function denseOfCompressed(m: SymmetricCsr): Matrix {
  const dense = Matrix.zeros(m.size, m.size);
  for (let i = 0; i < m.size; i++) {
    for (let p = m.rowStart[i]; p < m.rowStart[i + 1]; p++) {
      dense.set(i, m.column[p], m.value[p]);
      dense.set(m.column[p], i, m.value[p]);
    }
  }
  return dense;
}

/** A sparse Cholesky factorisation as the failure checks see it. */
export interface Factorisation {
  factor(matrix: SymmetricCsr): number;
  readonly isFactored: boolean;
  solve(b: Float64Array, x: Float64Array): void;
}

/**
 * Spoils fresh copies of an analysed matrix (first pivot negative, last pivot zero, all zero, a
 * NaN on the diagonal; `order` the factor's ordering) and expects each factor to return NaN
 * without throwing, leave no factor and refuse to solve. ml-matrix confirms that the spoiled
 * matrices (but the NaN one) are not positive definite.
 */
export function expectSpoiledMatricesFail(cholesky: Factorisation, fresh: () => SymmetricCsr, order: Int32Array): void {
  const n = order.length;
  const spoilers: [string, (m: SymmetricCsr) => void][] = [
    ['negative first pivot', (m) => setDiagonal(m, order[0], -1)],
    ['zero last pivot', (m) => setDiagonal(m, order[n - 1], 0)],
    ['zero matrix', (m) => m.value.fill(0, 0, m.rowStart[m.size])],
    ['NaN entry', (m) => setDiagonal(m, order[n >> 1], Number.NaN)],
  ];
  for (const [name, spoil] of spoilers) {
    const m = fresh();
    spoil(m);
    if (name !== 'NaN entry') expect(new CholeskyDecomposition(denseOfCompressed(m)).isPositiveDefinite(), name).toBe(false);
    let logDet = 0;
    expect(() => (logDet = cholesky.factor(m)), name).not.toThrow();
    expect(logDet, name).toBeNaN();
    expect(cholesky.isFactored, name).toBe(false);
    expect(() => cholesky.solve(new Float64Array(n), new Float64Array(n)), name).toThrow();
  }
}

/** Solves one random system with both factorisations and expects the very same solution. */
export function expectSameSolutions(a: Factorisation, b: Factorisation, n: number, name: string): void {
  const rhs = randomVector(n, uniformStream(2 * n));
  const xa = new Float64Array(n);
  const xb = new Float64Array(n);
  a.solve(rhs, xa);
  b.solve(rhs, xb);
  expect(Array.from(xa), name).toEqual(Array.from(xb));
}

/** The 0 x 0 matrix. */
export function emptyMatrix(): SymmetricCsr {
  const accumulator = new SymmetricSparseAccumulator();
  accumulator.reset(0);
  return accumulator.compress();
}
