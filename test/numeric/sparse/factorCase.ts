// Runs the sparse pipeline (accumulate, order, analyse, factor) on a test case, and the dense
// reference (ml-matrix's Cholesky decomposition) beside it.
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { EnvelopeCholesky } from '../../../src/numeric/sparse/envelopeCholesky.js';
import { ReverseCuthillMcKee } from '../../../src/numeric/sparse/reverseCuthillMcKee.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../../../src/numeric/sparse/symmetricCsr.js';
import { accumulate, type SparseCase } from './sparseTestMatrices.js';

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
  const dense = /(\d+) dense$/.exec(c.name);
  const last = dense ? Array.from({ length: Number(dense[1]) }, (_, t) => c.n - Number(dense[1]) + t) : [];
  const order = kernel.ordering.order(matrix, new Int32Array(c.n), last);
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
