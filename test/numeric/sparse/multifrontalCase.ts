// Runs the nested-dissection multifrontal pipeline (accumulate, order, analyse, factor) on a
// test case; the dense reference is in factorCase.ts.
import { MultifrontalCholesky } from '../../../src/numeric/sparse/multifrontalCholesky.js';
import { NestedDissection } from '../../../src/numeric/sparse/nestedDissection.js';
import type { SupernodeTree } from '../../../src/numeric/sparse/supernodeTree.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../../../src/numeric/sparse/symmetricCsr.js';
import { accumulate, denseTail, planePoints, type Points, type SparseCase } from './sparseTestMatrices.js';

/** The instances one pipeline uses; pass the same one to several calls to test reuse. */
export interface MultifrontalKernel {
  readonly accumulator: SymmetricSparseAccumulator;
  readonly dissection: NestedDissection;
  readonly cholesky: MultifrontalCholesky;
}

export function newMultifrontalKernel(leafSize?: number): MultifrontalKernel {
  return { accumulator: new SymmetricSparseAccumulator(), dissection: new NestedDissection(leafSize), cholesky: new MultifrontalCholesky() };
}

/**
 * Accumulates, orders by nested dissection (dense tail in the root; coordinates when given),
 * analyses and factors `c`; returns the compressed matrix, the tree, the ordering and ln det.
 */
export function factorMultifrontal(
  kernel: MultifrontalKernel, c: SparseCase, uniform: () => number, points: Points | null = null,
): { matrix: SymmetricCsr; tree: SupernodeTree; order: Int32Array; logDet: number } {
  const matrix = accumulate(kernel.accumulator, c, uniform);
  const order = new Int32Array(c.n);
  const tree = kernel.dissection.order(matrix, planePoints(points), denseTail(c), order);
  kernel.cholesky.analyse(matrix, order, tree);
  return { matrix, tree, order, logDet: kernel.cholesky.factor(matrix) };
}
