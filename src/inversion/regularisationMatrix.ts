import { EnvelopeCholesky } from '../numeric/sparse/envelopeCholesky.js';
import { ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import { ReverseCuthillMcKee } from '../numeric/sparse/reverseCuthillMcKee.js';
import { SymmetricSparseAccumulator } from '../numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';
import type { DifferenceRows } from './sourceMesh.js';

/**
 * A regularisation matrix H = D^T diag(w) D from the rows of a difference operator D and row
 * weights w (1 when none are given), in compressed lower-triangle form, and ln det H by a sparse
 * Cholesky factorisation in reverse Cuthill-McKee order. Buffers are reused across calls.
 */
export class RegularisationMatrix {
  private readonly accumulator = new SymmetricSparseAccumulator();
  private readonly ordering = new ReverseCuthillMcKee();
  private readonly cholesky = new EnvelopeCholesky();
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

  /** ln det H of the last build (NaN when H is not positive definite). */
  logDeterminant(): number {
    const matrix = this.matrix!;
    this.order = ensureInt32Capacity(this.order, matrix.size);
    this.cholesky.analyse(matrix, this.ordering.order(matrix, this.order));
    return this.cholesky.factor(matrix);
  }
}
