/**
 * The 4 x 4 block of inner products out[4 r + c] = sum_p a[rowA + r, p] a[rowB + c, p] over the
 * columns p = column .. column + width - 1 of a column-major array `a` (entry [i, p] at
 * a[p * ld + i]): the register-blocked inner kernel of the dense steps of the supernodal
 * Cholesky (Goto & van de Geijn 2008, ACM Trans. Math. Software 34, 12: a small block of the
 * product held in registers, each value loaded used four times). Sixteen independent sums, so
 * consecutive additions do not wait for one another. `width` is at most the block size of the
 * caller, so the loop is short.
 */
export function productTile(
  a: Float64Array, ld: number, rowA: number, rowB: number, column: number, width: number, out: Float64Array,
): void {
  let c00 = 0, c01 = 0, c02 = 0, c03 = 0, c10 = 0, c11 = 0, c12 = 0, c13 = 0;
  let c20 = 0, c21 = 0, c22 = 0, c23 = 0, c30 = 0, c31 = 0, c32 = 0, c33 = 0;
  const end = (column + width) * ld;
  for (let q = column * ld; q < end; q += ld) {
    const a0 = a[q + rowA], a1 = a[q + rowA + 1], a2 = a[q + rowA + 2], a3 = a[q + rowA + 3];
    const b0 = a[q + rowB], b1 = a[q + rowB + 1], b2 = a[q + rowB + 2], b3 = a[q + rowB + 3];
    c00 += a0 * b0; c01 += a0 * b1; c02 += a0 * b2; c03 += a0 * b3;
    c10 += a1 * b0; c11 += a1 * b1; c12 += a1 * b2; c13 += a1 * b3;
    c20 += a2 * b0; c21 += a2 * b1; c22 += a2 * b2; c23 += a2 * b3;
    c30 += a3 * b0; c31 += a3 * b1; c32 += a3 * b2; c33 += a3 * b3;
  }
  out[0] = c00; out[1] = c01; out[2] = c02; out[3] = c03;
  out[4] = c10; out[5] = c11; out[6] = c12; out[7] = c13;
  out[8] = c20; out[9] = c21; out[10] = c22; out[11] = c23;
  out[12] = c30; out[13] = c31; out[14] = c32; out[15] = c33;
}

/** sum_p a[i, p] a[j, p] over columns p = column .. column + width - 1 (one entry: the edges of a tiled loop). */
export function columnProduct(a: Float64Array, ld: number, i: number, j: number, column: number, width: number): number {
  let s = 0;
  const end = (column + width) * ld;
  for (let q = column * ld; q < end; q += ld) s += a[q + i] * a[q + j];
  return s;
}
