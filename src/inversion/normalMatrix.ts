import { dot } from '../numeric/sparse/dot.js';
import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';
import { projectRows, rowSpan, WeightedGramBand, type GrowableLowerRows } from '../numeric/sparse/weightedGramBand.js';
import { SparseRows } from './sparseRows.js';

/**
 * B^T W B is accumulated in a dense band of its lower triangle (S rows of the band's width,
 * WeightedGramBand) when that holds at most this many entries (8 bytes each: 64 MB at the
 * limit; the regular 64 x 64 grid of the demo needs 5.3 million), else row by row through B^T.
 */
const DENSE_BAND_ENTRIES = 8_000_000;

/**
 * The posterior precision and right-hand side of a regularised linear inversion (Warren & Dye
 * 2003; Suyu et al. 2006): for S source cells and K further linear amplitudes (the analytic light
 * bases L, packed at the used pixels) with data d and inverse variances w at the used pixels,
 *   A = [[B^T W B + H,  B^T W L], [L^T W B,  L^T W L + I / s^2]],   b = [B^T W d, L^T W d],
 * H the regularisation matrix (times its strength). The lower triangle of A is built row by row
 * (the row-wise sparse product of Gustavson 1978 for B^T W B, through the transpose of B) into
 * compressed rows, the K amplitude rows dense and last. Buffers are reused across calls.
 */
export class NormalMatrix implements SymmetricCsr, GrowableLowerRows {
  size = 0;
  rowStart: Int32Array<ArrayBuffer> = new Int32Array(1);
  column: Int32Array<ArrayBuffer> = new Int32Array(0);
  value: Float64Array<ArrayBuffer> = new Float64Array(0);
  /** b, S + K entries. */
  rhs: Float64Array<ArrayBuffer> = new Float64Array(0);
  private work = new Float64Array(0);
  /** Per used pixel, W d then W L_a (count blocks of n), and their products with B^T (count blocks of S). */
  private weighted = new Float64Array(0);
  private projected = new Float64Array(0);
  /** B^T, made here when the caller gives none and the band is too wide. */
  private readonly ownTranspose = new SparseRows();
  private slot = new Int32Array(0);
  /** The dense band of B^T W B and its kernels (accumulation, then H added and the rows read out). */
  private readonly gram = new WeightedGramBand();

  /**
   * Builds A and b. `bt` is the transpose of B (cell rows of (used pixel, value)), or null to
   * have it made here when it is needed (above the dense band's limit); `hScale` multiplies H;
   * `extras` holds K bases of n used pixels (basis a at extras[a * n + e]).
   */
  build(
    b: SparseRows, bt: SparseRows | null, cellCount: number, w: Float64Array, d: Float64Array,
    h: SymmetricCsr, hScale: number, extras: Float64Array, extraCount: number, extraPrecision: number,
  ): void {
    const size = cellCount + extraCount;
    const n = w.length;
    const count = 1 + extraCount;
    this.size = size;
    this.rowStart = ensureInt32Capacity(this.rowStart, size + 1);
    this.rhs = ensureFloat64Capacity(this.rhs, size);
    if (this.slot.length < cellCount) {
      this.slot = ensureInt32Capacity(this.slot, cellCount);
      this.slot.fill(-1);
      this.work = ensureFloat64Capacity(this.work, cellCount);
    }
    // W d, then W L_a: the vectors whose products with B^T make b and the amplitude rows.
    const weighted = this.weighted = ensureFloat64Capacity(this.weighted, count * n);
    for (let e = 0; e < n; e++) weighted[e] = w[e] * d[e];
    for (let a = 0; a < extraCount; a++) for (let e = 0; e < n; e++) weighted[(1 + a) * n + e] = w[e] * extras[a * n + e];
    this.rowStart[0] = 0;
    let end = 0;
    let projected: Float64Array;
    const band = Math.max(rowSpan(b), lowerSpan(h, cellCount));
    if (cellCount * band <= DENSE_BAND_ENTRIES) {
      this.gram.accumulate(b, w, cellCount, band, h.rowStart[cellCount], count);
      end = this.gram.compactRows(h, hScale, cellCount, band, this);
      projected = this.gram.project(weighted, count, cellCount);
    } else {
      let transposed = bt;
      if (transposed === null) {
        this.ownTranspose.transposeOf(b, cellCount);
        transposed = this.ownTranspose;
      }
      for (let j = 0; j < cellCount; j++) end = this.cellRow(j, end, b, transposed, w, h, hScale);
      projected = this.projected = ensureFloat64Capacity(this.projected, count * cellCount);
      projectRows(b, weighted, count, projected, cellCount);
    }
    for (let a = 0; a < extraCount; a++) end = this.extraRow(a, end, projected, cellCount, n, extras, extraPrecision);
    for (let j = 0; j < cellCount; j++) this.rhs[j] = projected[j];
    for (let a = 0; a < extraCount; a++) this.rhs[cellCount + a] = dot(weighted, 0, extras, a * n, n);
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

  /**
   * Row cellCount + a: (L^T W B)_ak for every cell k (from the projections), then
   * (L^T W L)_ab + precision for b <= a.
   */
  private extraRow(a: number, end: number, projected: Float64Array, cellCount: number, n: number, extras: Float64Array, precision: number): number {
    if (this.column.length < end + cellCount + a + 1) this.grow(2 * (end + cellCount + a + 1));
    const { column, value, weighted } = this;
    for (let k = 0; k < cellCount; k++) {
      column[end] = k;
      value[end++] = projected[(1 + a) * cellCount + k];
    }
    for (let c = 0; c <= a; c++) {
      const sum = dot(weighted, (1 + a) * n, extras, c * n, n);
      column[end] = cellCount + c;
      value[end++] = c === a ? sum + precision : sum;
    }
    this.rowStart[cellCount + a + 1] = end;
    return end;
  }

  /** Room for `entries` entries, those written kept. */
  grow(entries: number): void {
    this.column = ensureInt32Capacity(this.column, entries);
    this.value = ensureFloat64Capacity(this.value, entries);
  }
}

/** The band from the first column of each of a lower triangle's first `rows` rows to the diagonal. */
function lowerSpan(lower: SymmetricCsr, rows: number): number {
  let span = 1;
  for (let r = 0; r < rows; r++) {
    for (let k = lower.rowStart[r]; k < lower.rowStart[r + 1]; k++) span = Math.max(span, r - lower.column[k] + 1);
  }
  return span;
}
