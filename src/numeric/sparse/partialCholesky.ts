import { panelTriangularSolve } from './panelTriangularSolve.js';
import { symmetricRankUpdate } from './symmetricRankUpdate.js';

/** Columns factored per step: the width of the panel each rank update reads (see the commit that set it). */
export const PARTIAL_CHOLESKY_BLOCK = 64;

/**
 * Partial Cholesky factorisation of a dense symmetric front (the elimination step of the
 * multifrontal method, Duff & Reid 1983, ACM Trans. Math. Software 9, 302): for the size x size
 * lower triangle of the column-major array `a` (leading dimension ld), the first `columns`
 * columns become those of L and the trailing block becomes the Schur complement
 * A22 - L21 L21^T (the update matrix passed to the parent). Right-looking and blocked (Golub &
 * Van Loan 2013, Algorithm 4.2.3 read as a partial factorisation): per block of columns, the
 * diagonal block, the panel below it (panelTriangularSolve), the trailing lower triangle
 * (symmetricRankUpdate). Returns 2 sum ln L_jj over the columns factored, or NaN at the first
 * pivot that is not positive (the rest of `a` is then left part-way).
 */
export function partialCholesky(a: Float64Array, ld: number, size: number, columns: number): number {
  let logDet = 0;
  for (let k = 0; k < columns; k += PARTIAL_CHOLESKY_BLOCK) {
    const width = Math.min(PARTIAL_CHOLESKY_BLOCK, columns - k);
    const blockLogDet = diagonalBlockCholesky(a, ld, k, width);
    if (Number.isNaN(blockLogDet)) return Number.NaN;
    logDet += blockLogDet;
    panelTriangularSolve(a, ld, k, width, k + width, size - k - width);
    symmetricRankUpdate(a, ld, k + width, size - k - width, k, width);
  }
  return logDet;
}

/**
 * Unblocked right-looking Cholesky of the width x width diagonal block at (k, k) (Golub &
 * Van Loan 2013, Algorithm 4.2.2, outer-product form): contiguous column updates. Returns
 * 2 sum ln L_jj, or NaN for a pivot that is not positive.
 */
function diagonalBlockCholesky(a: Float64Array, ld: number, k: number, width: number): number {
  let logDet = 0;
  for (let j = k; j < k + width; j++) {
    const pivot = a[j * ld + j];
    if (!(pivot > 0)) return Number.NaN;
    const root = Math.sqrt(pivot);
    logDet += 2 * Math.log(root);
    eliminateColumn(a, ld, j, root, k + width);
  }
  return logDet;
}

/** Stores L_jj = root, scales column j below it, and subtracts its outer product from the columns right of it up to `end`. */
function eliminateColumn(a: Float64Array, ld: number, j: number, root: number, end: number): void {
  const cj = j * ld;
  a[cj + j] = root;
  const inverse = 1 / root;
  for (let i = j + 1; i < end; i++) a[cj + i] *= inverse;
  for (let c = j + 1; c < end; c++) {
    const lcj = a[cj + c];
    const cc = c * ld;
    for (let i = c; i < end; i++) a[cc + i] -= a[cj + i] * lcj;
  }
}
