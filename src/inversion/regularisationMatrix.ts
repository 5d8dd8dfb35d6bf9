import { ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import { MultifrontalCholesky } from '../numeric/sparse/multifrontalCholesky.js';
import type { PlanePoints } from '../numeric/sparse/nestedDissection.js';
import { PrincipalAxisOrder } from '../numeric/sparse/principalAxisOrder.js';
import { ReverseCuthillMcKee } from '../numeric/sparse/reverseCuthillMcKee.js';
import { SupernodeChain } from '../numeric/sparse/supernodeChain.js';
import { SymmetricSparseAccumulator } from '../numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';
import type { DifferenceRows } from './sourceMesh.js';

const NO_INDICES: readonly number[] = [];

/**
 * Columns per block of H's chain. H couples only mesh neighbours, so its fronts are narrow and
 * shorter blocks waste fewer zeros: on adaptive1000 (pixelSource) the regularisation stage took
 * 1.52 ms with 16, 1.59 with 32, 2.26 with 64 and 1.68 ms with the envelope Cholesky.
 */
export const REGULARISATION_CHAIN_BLOCK = 16;

/**
 * A regularisation matrix H = D^T diag(w) D from the rows of a difference operator D and row
 * weights w (1 when none are given), in compressed lower-triangle form, and ln det H by the
 * multifrontal Cholesky over a chain of REGULARISATION_CHAIN_BLOCK-column blocks of a profile
 * order (a blocked envelope factorisation whose dense steps run in the SIMD kernels): the cells
 * swept along the principal axis of their coordinates when given (PrincipalAxisOrder: on the
 * demo's mesh its envelope takes about half the operations of reverse Cuthill-McKee's, and it
 * needs no pass over the graph), in reverse Cuthill-McKee order otherwise. Buffers are reused
 * across calls.
 */
export class RegularisationMatrix {
  private readonly accumulator = new SymmetricSparseAccumulator();
  private readonly ordering = new ReverseCuthillMcKee();
  private readonly sweep = new PrincipalAxisOrder();
  private readonly cholesky = new MultifrontalCholesky();
  private readonly chain = new SupernodeChain();
  private order = new Int32Array(0);
  private matrix: SymmetricCsr | undefined;

  /** Builds H for `cellCount` cells; the result is valid until the next build. */
  build(rows: DifferenceRows, cellCount: number, rowWeights?: Float64Array): SymmetricCsr {
    const accumulator = this.accumulator;
    accumulator.reset(cellCount);
    this.addRows(rows, rowWeights);
    this.matrix = accumulator.compress();
    return this.matrix;
  }

  /** Each row's outer product w_r d_r d_r^T, each off-diagonal pair once. */
  private addRows(rows: DifferenceRows, rowWeights: Float64Array | undefined): void {
    const { rowStart, cell, coefficient } = rows;
    const accumulator = this.accumulator;
    for (let r = 0; r < rows.rowCount; r++) {
      const weight = rowWeights === undefined ? 1 : rowWeights[r];
      const from = rowStart[r], to = rowStart[r + 1];
      for (let a = from; a < to; a++) {
        const va = weight * coefficient[a];
        for (let b = from; b <= a; b++) accumulator.add(cell[a], cell[b], va * coefficient[b]);
      }
    }
  }

  /**
   * ln det H of the last build (NaN when H is not positive definite); `points`: the cells' plane
   * coordinates, or null.
   */
  logDeterminant(points: PlanePoints | null = null): number {
    const matrix = this.matrix!;
    this.order = ensureInt32Capacity(this.order, matrix.size);
    const order = points !== null && points.count === matrix.size
      ? this.sweep.order(points, this.order, NO_INDICES)
      : this.ordering.order(matrix, this.order);
    return this.cholesky.analyseAndFactor(matrix, order, this.chain.build(matrix.size, REGULARISATION_CHAIN_BLOCK));
  }
}
