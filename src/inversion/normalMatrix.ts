import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';
import type { SparseRows } from './sparseRows.js';

/** Meshes of at most this many cells accumulate B^T W B in a dense triangle (8 S^2 bytes: 20 MB at the limit). */
const DENSE_CELLS = 1600;

/**
 * The posterior precision and right-hand side of a regularised linear inversion (Warren & Dye
 * 2003; Suyu et al. 2006): for S source cells and K further linear amplitudes (the analytic light
 * bases L, packed at the used pixels) with data d and inverse variances w at the used pixels,
 *   A = [[B^T W B + H,  B^T W L], [L^T W B,  L^T W L + I / s^2]],   b = [B^T W d, L^T W d],
 * H the regularisation matrix (times its strength). The lower triangle of A is built row by row
 * (the row-wise sparse product of Gustavson 1978 for B^T W B, through the transpose of B) into
 * compressed rows, the K amplitude rows dense and last. Buffers are reused across calls.
 */
export class NormalMatrix implements SymmetricCsr {
  size = 0;
  rowStart: Int32Array<ArrayBuffer> = new Int32Array(1);
  column: Int32Array<ArrayBuffer> = new Int32Array(0);
  value: Float64Array<ArrayBuffer> = new Float64Array(0);
  /** b, S + K entries. */
  rhs: Float64Array<ArrayBuffer> = new Float64Array(0);
  private work = new Float64Array(0);
  private slot = new Int32Array(0);
  /** Dense lower triangle of B^T W B (row-major S x S), for meshes of at most DENSE_CELLS cells. */
  private dense = new Float64Array(0);

  /**
   * Builds A and b. `bt` is the transpose of B (cell rows of (used pixel, value)); `hScale`
   * multiplies H; `extras` holds K bases of n used pixels (basis a at extras[a * n + e]).
   */
  build(
    b: SparseRows, bt: SparseRows, cellCount: number, w: Float64Array, d: Float64Array,
    h: SymmetricCsr, hScale: number, extras: Float64Array, extraCount: number, extraPrecision: number,
  ): void {
    const size = cellCount + extraCount;
    this.size = size;
    this.rowStart = ensureInt32Capacity(this.rowStart, size + 1);
    this.rhs = ensureFloat64Capacity(this.rhs, size);
    if (this.slot.length < cellCount) {
      this.slot = ensureInt32Capacity(this.slot, cellCount);
      this.slot.fill(-1);
      this.work = ensureFloat64Capacity(this.work, cellCount);
    }
    this.rowStart[0] = 0;
    let end = 0;
    if (cellCount <= DENSE_CELLS) {
      if (this.dense.length < cellCount * cellCount) this.dense = new Float64Array(cellCount * cellCount);
      this.accumulateDense(b, w, cellCount);
      for (let j = 0; j < cellCount; j++) end = this.denseRow(j, end, cellCount, h, hScale);
    } else {
      for (let j = 0; j < cellCount; j++) end = this.cellRow(j, end, b, bt, w, h, hScale);
    }
    for (let a = 0; a < extraCount; a++) end = this.extraRow(a, end, bt, cellCount, w, extras, extraCount, extraPrecision);
    this.cellRhs(bt, cellCount, w, d);
    this.extraRhs(cellCount, w, d, extras, extraCount);
  }

  /**
   * B^T W B into the dense lower triangle, pixel by pixel: each pair of a row's entries (cells
   * sorted increasing, so the pairs with b <= a are a prefix) adds w_e B_ea B_eb at (a, b).
   */
  private accumulateDense(b: SparseRows, w: Float64Array, cellCount: number): void {
    const dense = this.dense;
    const { rowStart, column, value } = b;
    for (let e = 0; e < b.rowCount; e++) {
      const from = rowStart[e], to = rowStart[e + 1];
      const we = w[e];
      for (let x = from; x < to; x++) {
        const vx = we * value[x];
        const rowX = column[x] * cellCount;
        for (let y = from; y <= x; y++) dense[rowX + column[y]] += vx * value[y];
      }
    }
  }

  /** Row j from the dense triangle (its nonzeros, which it clears) and hScale H_jk. */
  private denseRow(j: number, end: number, cellCount: number, h: SymmetricCsr, hScale: number): number {
    if (this.column.length < end + j + 1) this.grow(2 * (end + j + 1));
    const dense = this.dense, column = this.column, value = this.value;
    const base = j * cellCount;
    for (let k = h.rowStart[j]; k < h.rowStart[j + 1]; k++) dense[base + h.column[k]] += hScale * h.value[k];
    for (let c = 0; c <= j; c++) {
      const v = dense[base + c];
      if (v !== 0) {
        column[end] = c;
        value[end++] = v;
        dense[base + c] = 0;
      }
    }
    this.rowStart[j + 1] = end;
    return end;
  }

  /** Row j (a cell) of the lower triangle: (B^T W B)_jk for k <= j, plus hScale H_jk. */
  private cellRow(j: number, end: number, b: SparseRows, bt: SparseRows, w: Float64Array, h: SymmetricCsr, hScale: number): number {
    const { slot, work } = this;
    const bStart = b.rowStart, bColumn = b.column, bValue = b.value;
    const start = end;
    const bound = end + this.rowBound(j, bt, b, h);
    if (this.column.length < bound) this.grow(2 * bound);
    const column = this.column;
    for (let t = bt.rowStart[j]; t < bt.rowStart[j + 1]; t++) {
      const e = bt.column[t];
      const wv = w[e] * bt.value[t];
      for (let k = bStart[e]; k < bStart[e + 1]; k++) {
        const c = bColumn[k];
        if (c > j) break;
        if (slot[c] < 0) {
          slot[c] = end;
          column[end++] = c;
          work[c] = wv * bValue[k];
        } else work[c] += wv * bValue[k];
      }
    }
    for (let k = h.rowStart[j]; k < h.rowStart[j + 1]; k++) {
      const c = h.column[k];
      if (slot[c] < 0) {
        slot[c] = end;
        column[end++] = c;
        work[c] = hScale * h.value[k];
      } else work[c] += hScale * h.value[k];
    }
    const value = this.value;
    for (let k = start; k < end; k++) {
      const c = column[k];
      value[k] = work[c];
      slot[c] = -1;
    }
    this.rowStart[j + 1] = end;
    return end;
  }

  /** The most entries row j can have: its products' lengths and H's row, at most j + 1. */
  private rowBound(j: number, bt: SparseRows, b: SparseRows, h: SymmetricCsr): number {
    let bound = h.rowStart[j + 1] - h.rowStart[j];
    for (let t = bt.rowStart[j]; t < bt.rowStart[j + 1]; t++) {
      const e = bt.column[t];
      bound += b.rowStart[e + 1] - b.rowStart[e];
    }
    return Math.min(bound, j + 1);
  }

  /** Row cellCount + a: (L^T W B)_ak for every cell k, then (L^T W L)_ab + precision for b <= a. */
  private extraRow(
    a: number, end: number, bt: SparseRows, cellCount: number, w: Float64Array, extras: Float64Array,
    extraCount: number, precision: number,
  ): number {
    const n = w.length;
    if (this.column.length < end + cellCount + a + 1) this.grow(2 * (end + cellCount + a + 1));
    const { column, value } = this;
    const base = a * n;
    for (let k = 0; k < cellCount; k++) {
      let sum = 0;
      for (let t = bt.rowStart[k]; t < bt.rowStart[k + 1]; t++) {
        const e = bt.column[t];
        sum += w[e] * extras[base + e] * bt.value[t];
      }
      column[end] = k;
      value[end++] = sum;
    }
    for (let c = 0; c <= a; c++) {
      let sum = 0;
      const other = c * n;
      for (let e = 0; e < n; e++) sum += w[e] * extras[base + e] * extras[other + e];
      column[end] = cellCount + c;
      value[end++] = c === a ? sum + precision : sum;
    }
    this.rowStart[cellCount + a + 1] = end;
    return end;
  }

  private cellRhs(bt: SparseRows, cellCount: number, w: Float64Array, d: Float64Array): void {
    const rhs = this.rhs;
    for (let j = 0; j < cellCount; j++) {
      let sum = 0;
      for (let t = bt.rowStart[j]; t < bt.rowStart[j + 1]; t++) {
        const e = bt.column[t];
        sum += w[e] * d[e] * bt.value[t];
      }
      rhs[j] = sum;
    }
  }

  private extraRhs(cellCount: number, w: Float64Array, d: Float64Array, extras: Float64Array, extraCount: number): void {
    const n = w.length;
    for (let a = 0; a < extraCount; a++) {
      let sum = 0;
      for (let e = 0; e < n; e++) sum += w[e] * d[e] * extras[a * n + e];
      this.rhs[cellCount + a] = sum;
    }
  }

  private grow(entries: number): void {
    this.column = ensureInt32Capacity(this.column, entries);
    this.value = ensureFloat64Capacity(this.value, entries);
  }
}
