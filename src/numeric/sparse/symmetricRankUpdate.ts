import { columnProduct, productTile } from './productTile.js';
import { simdKernelsOf, type SimdTileKernels } from './simdTileKernels.js';

const TILE = new Float64Array(16);

/**
 * The symmetric rank-k update C := C - P P^T on the lower triangle of a square block of a
 * column-major array (the level-3 BLAS operation SYRK, Dongarra, Du Croz, Duff & Hammarling
 * 1990, ACM Trans. Math. Software 16, 1): C is a[first .. first + size - 1, same columns], P is
 * a[first .., panel .. panel + width - 1] (the factored columns left of C, in a front of the
 * multifrontal Cholesky). Register-blocked 4 x 4 (productTile); the last size mod 4 rows
 * entry by entry. Entries above the diagonal are neither read nor written. When `a` lives in a
 * memory of the SIMD kernels (ensureSimdFloat64Capacity), the tiles below the diagonal and the
 * last rows left of the corner run there, with the same result to the bit.
 */
export function symmetricRankUpdate(a: Float64Array, ld: number, first: number, size: number, panel: number, width: number): void {
  if (size <= 0 || width <= 0) return;
  const blockedEnd = first + size - (size & 3);
  const simd = simdKernelsOf(a);
  if (simd === undefined) {
    updateTiles(a, ld, first, blockedEnd, panel, width);
    updateLastRows(a, ld, first, blockedEnd, first + size, panel, width);
    return;
  }
  updateTilesSimd(a, simd, ld, first, blockedEnd, panel, width);
  // The last rows: their columns left of blockedEnd in the SIMD kernel, the corner entry by entry.
  for (let i = blockedEnd; i < first + size; i++) simd.rankUpdateRow(a.byteOffset, ld, i, first, blockedEnd, panel, width);
  updateLastRows(a, ld, blockedEnd, blockedEnd, first + size, panel, width);
}

/** updateTiles in the SIMD kernels: each block's diagonal tile, then the tiles below it. */
function updateTilesSimd(a: Float64Array, simd: SimdTileKernels, ld: number, first: number, blockedEnd: number, panel: number, width: number): void {
  for (let j = first; j < blockedEnd; j += 4) {
    simd.rankUpdateDiagonal(a.byteOffset, ld, j, panel, width);
    simd.rankUpdateColumns(a.byteOffset, ld, j, j + 4, blockedEnd, panel, width);
  }
}

/** Columns first .. blockedEnd - 1 in blocks of four, rows from the block's diagonal to blockedEnd - 1. */
function updateTiles(a: Float64Array, ld: number, first: number, blockedEnd: number, panel: number, width: number): void {
  for (let j = first; j < blockedEnd; j += 4) updateColumnBlock(a, ld, j, blockedEnd, panel, width);
}

function updateColumnBlock(a: Float64Array, ld: number, j: number, blockedEnd: number, panel: number, width: number): void {
  subtractDiagonalTile(a, ld, j, panel, width);
  for (let i = j + 4; i < blockedEnd; i += 4) subtractTile(a, ld, i, j, panel, width);
}

function subtractTile(a: Float64Array, ld: number, i: number, j: number, panel: number, width: number): void {
  productTile(a, ld, i, j, panel, width, TILE);
  let o = j * ld + i;
  a[o] -= TILE[0]; a[o + 1] -= TILE[4]; a[o + 2] -= TILE[8]; a[o + 3] -= TILE[12];
  o += ld;
  a[o] -= TILE[1]; a[o + 1] -= TILE[5]; a[o + 2] -= TILE[9]; a[o + 3] -= TILE[13];
  o += ld;
  a[o] -= TILE[2]; a[o + 1] -= TILE[6]; a[o + 2] -= TILE[10]; a[o + 3] -= TILE[14];
  o += ld;
  a[o] -= TILE[3]; a[o + 1] -= TILE[7]; a[o + 2] -= TILE[11]; a[o + 3] -= TILE[15];
}

/** A tile on the diagonal: its lower triangle only. */
function subtractDiagonalTile(a: Float64Array, ld: number, j: number, panel: number, width: number): void {
  productTile(a, ld, j, j, panel, width, TILE);
  let o = j * ld + j;
  a[o] -= TILE[0]; a[o + 1] -= TILE[4]; a[o + 2] -= TILE[8]; a[o + 3] -= TILE[12];
  o += ld;
  a[o + 1] -= TILE[5]; a[o + 2] -= TILE[9]; a[o + 3] -= TILE[13];
  o += ld;
  a[o + 2] -= TILE[10]; a[o + 3] -= TILE[14];
  o += ld;
  a[o + 3] -= TILE[15];
}

/** Rows blockedEnd .. end - 1 (at most three), each from column `first` to its diagonal. */
function updateLastRows(a: Float64Array, ld: number, first: number, blockedEnd: number, end: number, panel: number, width: number): void {
  for (let i = blockedEnd; i < end; i++) {
    for (let j = first; j <= i; j++) a[j * ld + i] -= columnProduct(a, ld, i, j, panel, width);
  }
}
