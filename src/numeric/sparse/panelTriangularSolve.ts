import { columnProduct, productTile } from './productTile.js';
import { simdKernelsOf, type SimdTileKernels } from './simdTileKernels.js';

const TILE = new Float64Array(16);

/**
 * The triangular solve with a factored diagonal block from the right, X L^T = B (the level-3
 * BLAS operation TRSM, Dongarra, Du Croz, Duff & Hammarling 1990, ACM Trans. Math. Software
 * 16, 1), in place on a column-major array: L is the lower triangle of a[diagonal ..
 * diagonal + width - 1, same columns], B the rows rowFrom .. rowFrom + rowCount - 1 of those
 * columns (the panel below the diagonal block of a front). Column by column, x_j = (b_j -
 * sum_{p < j} x_p L_jp) / L_jj; the sums for 4 rows x 4 columns at a time (productTile), then
 * the small triangle of the 4 columns; the last rowCount mod 4 rows and width mod 4 columns
 * entry by entry.
 */
export function panelTriangularSolve(a: Float64Array, ld: number, diagonal: number, width: number, rowFrom: number, rowCount: number): void {
  if (rowCount <= 0 || width <= 0) return;
  const blockedEnd = rowFrom + rowCount - (rowCount & 3);
  const simd = simdKernelsOf(a);
  if (simd === undefined) solveRowBlocks(a, ld, diagonal, width, rowFrom, blockedEnd);
  else solveRowBlocksSimd(a, simd, ld, diagonal, width, rowFrom, blockedEnd);
  solveLastRows(a, ld, diagonal, width, blockedEnd, rowFrom + rowCount);
}

/**
 * solveRowBlocks when `a` lives in a memory of the SIMD kernels: the 4 x 4 tiles there (same
 * operations, same bits), then the last width mod 4 columns of every row (each row's unknowns
 * depend only on that row's, so the order of rows does not matter).
 */
function solveRowBlocksSimd(a: Float64Array, simd: SimdTileKernels, ld: number, diagonal: number, width: number, rowFrom: number, blockedEnd: number): void {
  const blockedColumns = diagonal + width - (width & 3);
  simd.panelSolveRows(a.byteOffset, ld, diagonal, blockedColumns - diagonal, rowFrom, blockedEnd);
  for (let r = rowFrom; r < blockedEnd; r++) {
    for (let j = blockedColumns; j < diagonal + width; j++) solveEntry(a, ld, diagonal, r, j);
  }
}

function solveRowBlocks(a: Float64Array, ld: number, diagonal: number, width: number, rowFrom: number, blockedEnd: number): void {
  for (let i = rowFrom; i < blockedEnd; i += 4) solveRowBlock(a, ld, diagonal, width, i);
}

/** Rows i .. i + 3: the columns in blocks of four, then the last width mod 4 one by one. */
function solveRowBlock(a: Float64Array, ld: number, diagonal: number, width: number, i: number): void {
  const blockedColumns = diagonal + width - (width & 3);
  for (let j = diagonal; j < blockedColumns; j += 4) solveTile(a, ld, diagonal, i, j);
  for (let j = blockedColumns; j < diagonal + width; j++) {
    for (let r = i; r < i + 4; r++) solveEntry(a, ld, diagonal, r, j);
  }
}

/** Columns j .. j + 3 of rows i .. i + 3, given the columns left of j. */
function solveTile(a: Float64Array, ld: number, diagonal: number, i: number, j: number): void {
  productTile(a, ld, i, j, diagonal, j - diagonal, TILE);
  const c0 = j * ld;
  const c1 = c0 + ld;
  const c2 = c1 + ld;
  const c3 = c2 + ld;
  const l00 = a[c0 + j];
  const l10 = a[c0 + j + 1], l11 = a[c1 + j + 1];
  const l20 = a[c0 + j + 2], l21 = a[c1 + j + 2], l22 = a[c2 + j + 2];
  const l30 = a[c0 + j + 3], l31 = a[c1 + j + 3], l32 = a[c2 + j + 3], l33 = a[c3 + j + 3];
  for (let r = 0; r < 4; r++) {
    const x0 = (a[c0 + i + r] - TILE[4 * r]) / l00;
    const x1 = (a[c1 + i + r] - TILE[4 * r + 1] - x0 * l10) / l11;
    const x2 = (a[c2 + i + r] - TILE[4 * r + 2] - x0 * l20 - x1 * l21) / l22;
    const x3 = (a[c3 + i + r] - TILE[4 * r + 3] - x0 * l30 - x1 * l31 - x2 * l32) / l33;
    a[c0 + i + r] = x0;
    a[c1 + i + r] = x1;
    a[c2 + i + r] = x2;
    a[c3 + i + r] = x3;
  }
}

/** x_j of row r from the columns left of j. */
function solveEntry(a: Float64Array, ld: number, diagonal: number, r: number, j: number): void {
  a[j * ld + r] = (a[j * ld + r] - columnProduct(a, ld, r, j, diagonal, j - diagonal)) / a[j * ld + j];
}

/** The last rowCount mod 4 rows (at most three), entry by entry. */
function solveLastRows(a: Float64Array, ld: number, diagonal: number, width: number, from: number, to: number): void {
  for (let r = from; r < to; r++) {
    for (let j = diagonal; j < diagonal + width; j++) solveEntry(a, ld, diagonal, r, j);
  }
}
