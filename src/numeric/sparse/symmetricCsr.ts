/**
 * A symmetric sparse n x n matrix held as its lower triangle (diagonal included) in compressed
 * rows: the entries of row i are at positions rowStart[i] .. rowStart[i + 1] - 1, with column
 * indices column[p] <= i, no repeats, and values value[p]. Columns may come in any order (no step
 * of the kernel depends on it; the accumulator writes them increasing). The arrays may be
 * longer than needed (reused buffers); only the first size + 1 row pointers and the first
 * rowStart[size] entries count. The diagonal entry of a row may be absent (a structural zero).
 */
export interface SymmetricCsr {
  readonly size: number;
  readonly rowStart: Int32Array;
  readonly column: Int32Array;
  readonly value: Float64Array;
}

/** Number of stored entries (lower triangle, diagonal included) of `matrix`. */
export function storedEntries(matrix: SymmetricCsr): number {
  return matrix.rowStart[matrix.size];
}
