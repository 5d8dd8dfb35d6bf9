import { dot } from './dot.js';

// Forward and back substitution with the supernodes of a multifrontal Cholesky factor (each
// supernode a dense block of columns and the rows of its structure), and the permutation of the
// right-hand side and solution.

/**
 * Forward substitution with one supernode's columns: its own unknowns (dense lower triangle),
 * then the updates of its structure rows, summed in `structure` (contiguous column operations)
 * and subtracted from their rows of `work` once.
 */
export function forwardSupernode(
  lower: Float64Array, base: number, frontSize: number, width: number, first: number, rowIndex: Int32Array, from: number,
  work: Float64Array, structure: Float64Array,
): void {
  const m = frontSize - width;
  solveDiagonalBlock(lower, base, frontSize, width, first, work);
  structure.fill(0, 0, m);
  let j = 0;
  // Four columns per pass over the structure rows: each entry takes the same additions in the
  // same order as one column at a time, with a quarter of the loads and stores of `structure`.
  for (; j + 4 <= width; j += 4) {
    const c0 = base + j * frontSize + width, c1 = c0 + frontSize, c2 = c1 + frontSize, c3 = c2 + frontSize;
    const x0 = work[first + j], x1 = work[first + j + 1], x2 = work[first + j + 2], x3 = work[first + j + 3];
    for (let t = 0; t < m; t++) structure[t] = structure[t] + x0 * lower[c0 + t] + x1 * lower[c1 + t] + x2 * lower[c2 + t] + x3 * lower[c3 + t];
  }
  for (; j < width; j++) addMultiple(structure, lower, base + j * frontSize + width, work[first + j], m);
  for (let t = 0; t < m; t++) work[rowIndex[from + t]] -= structure[t];
}

/** L11 x = b in place on work[first .. first + width - 1], column by column. */
export function solveDiagonalBlock(lower: Float64Array, base: number, frontSize: number, width: number, first: number, work: Float64Array): void {
  for (let j = 0; j < width; j++) {
    const column = base + j * frontSize;
    const xj = work[first + j] / lower[column + j];
    work[first + j] = xj;
    for (let i = j + 1; i < width; i++) work[first + i] -= lower[column + i] * xj;
  }
}

/** y[0 .. length - 1] += factor * a[p ..]. */
export function addMultiple(y: Float64Array, a: Float64Array, p: number, factor: number, length: number): void {
  for (let t = 0; t < length; t++) y[t] += factor * a[p + t];
}

/**
 * Back substitution with one supernode's columns, last column first: the structure rows'
 * values gathered into `structure` once, then a contiguous dot product per column.
 */
export function backSupernode(
  lower: Float64Array, base: number, frontSize: number, width: number, first: number, rowIndex: Int32Array, from: number,
  work: Float64Array, structure: Float64Array,
): void {
  const m = frontSize - width;
  for (let t = 0; t < m; t++) structure[t] = work[rowIndex[from + t]];
  for (let j = width - 1; j >= 0; j--) {
    const column = base + j * frontSize;
    let sum = work[first + j] - dot(lower, column + width, structure, 0, m);
    for (let i = j + 1; i < width; i++) sum -= lower[column + i] * work[first + i];
    work[first + j] = sum / lower[column + j];
  }
}

export function gather(b: Float64Array, order: Int32Array, n: number, out: Float64Array): void {
  for (let k = 0; k < n; k++) out[k] = b[order[k]];
}

export function scatter(work: Float64Array, order: Int32Array, n: number, x: Float64Array): void {
  for (let k = 0; k < n; k++) x[order[k]] = work[k];
}
