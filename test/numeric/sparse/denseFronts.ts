// Dense test matrices for the kernels of the supernodal Cholesky, and their column-major
// storage with a leading dimension, as a front of the multifrontal method holds them.
import { Matrix } from 'ml-matrix';
import { ensureSimdFloat64Capacity } from '../../../src/numeric/sparse/simdTileKernels.js';

/** Unit roundoff of IEEE double precision, 2^-53. */
export const UNIT_ROUNDOFF = 2 ** -53;

/**
 * A dense n x n symmetric matrix with entries uniform in [-1, 1] and a diagonal exceeding its
 * row's absolute sum by `margin`: strictly diagonally dominant, so positive definite with
 * condition number below (2 max row sum + margin) / margin (Gershgorin 1931).
 */
export function dominantDense(n: number, uniform: () => number, margin: number): Matrix {
  const a = Matrix.zeros(n, n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < i; j++) {
      const v = 2 * uniform() - 1;
      a.set(i, j, v);
      a.set(j, i, v);
    }
  }
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let j = 0; j < n; j++) if (j !== i) sum += Math.abs(a.get(i, j));
    a.set(i, i, sum + margin);
  }
  return a;
}

/** A random rows x columns matrix, entries uniform in [-1, 1]. */
export function randomDense(rows: number, columns: number, uniform: () => number): Matrix {
  const a = Matrix.zeros(rows, columns);
  for (let i = 0; i < rows; i++) for (let j = 0; j < columns; j++) a.set(i, j, 2 * uniform() - 1);
  return a;
}

/** `m` stored column-major at rows/columns offset .. offset + size - 1 of an ld x ld array filled with `fill`. */
export function columnMajor(m: Matrix, ld: number, offset = 0, fill = Number.NaN): Float64Array {
  const a = new Float64Array(ld * ld).fill(fill);
  for (let j = 0; j < m.columns; j++) for (let i = 0; i < m.rows; i++) a[(offset + j) * ld + offset + i] = m.get(i, j);
  return a;
}

/** The rows x columns block at (row, column) of a column-major array. */
export function blockOf(a: Float64Array, ld: number, row: number, column: number, rows: number, columns: number): Matrix {
  const m = Matrix.zeros(rows, columns);
  for (let j = 0; j < columns; j++) for (let i = 0; i < rows; i++) m.set(i, j, a[(column + j) * ld + row + i]);
  return m;
}

/** The lower triangle of a square matrix (the upper set to zero). */
export function lowerOf(m: Matrix): Matrix {
  const l = m.clone();
  for (let i = 0; i < m.rows; i++) for (let j = i + 1; j < m.columns; j++) l.set(i, j, 0);
  return l;
}

/** max |x - y| over max |y|, on the lower triangle only when `lowerOnly`. */
export function matrixDifference(x: Matrix, y: Matrix, lowerOnly = false): number {
  let difference = 0;
  let scale = 0;
  for (let i = 0; i < y.rows; i++) {
    for (let j = 0; j < (lowerOnly ? i + 1 : y.columns); j++) {
      difference = Math.max(difference, Math.abs(x.get(i, j) - y.get(i, j)));
      scale = Math.max(scale, Math.abs(y.get(i, j)));
    }
  }
  return difference / scale;
}

/** The infinity-norm condition number ||L|| ||L^-1|| of a square matrix (inverse by ml-matrix). */
export function infinityCondition(l: Matrix, inverse: Matrix): number {
  const norm = (m: Matrix): number => Math.max(...Array.from({ length: m.rows }, (_, i) => m.getRow(i).reduce((s, v) => s + Math.abs(v), 0)));
  return norm(l) * norm(inverse);
}

/** A plain array, or one in a memory of the SIMD kernels (as the multifrontal fronts are): the dense kernels are tested on both. */
export const ALLOCATORS = {
  plain: (n: number): Float64Array => new Float64Array(n),
  simd: (n: number): Float64Array => ensureSimdFloat64Capacity(new Float64Array(0), n).subarray(0, n),
} as const;
