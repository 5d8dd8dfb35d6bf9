import type { PsfKernel } from '../imaging/psfKernel.js';
import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import type { SparseRows } from './sparseRows.js';

/** Stamps restart from zero before the generation count could overflow an Int32. */
const GENERATION_LIMIT = 2 ** 30;

/**
 * The blurred mapping matrix B = P M at the used pixels (Warren & Dye 2003; the PSF applied to
 * each cell's lensed image): row e of B, for used pixel `used[e]`, is the sum over the kernel's
 * taps of the tap times the row of M of the computed pixel it reads, with the convolution and
 * zero boundary of directConvolution. `computedIndex[pixel]` is a pixel's row in M (-1 when not
 * computed: no light). Which rows of M each used pixel reads, and with which tap, is fixed by the
 * grid and kernel and listed once (the stencil). Rows are merged through a dense work row over
 * the cells, then sorted increasing: the normal matrix's products stop at a cell, and its dense
 * accumulation then walks each row of its triangle in increasing addresses.
 */
export class BlurredMapping {
  private work = new Float64Array(0);
  /** stamp[c] === generation while cell c is in the row being built. */
  private stamp = new Int32Array(0);
  private generation = 0;
  private readonly stencilStart: Int32Array;
  private readonly stencilRow: Int32Array;
  private readonly stencilTap: Float64Array;

  constructor(columns: number, rows: number, kernel: PsfKernel, used: Int32Array, computedIndex: Int32Array) {
    const { columns: kc, rows: kr, values } = kernel;
    const centreA = (kc - 1) / 2, centreB = (kr - 1) / 2;
    const start = new Int32Array(used.length + 1);
    const rowList: number[] = [];
    const tapList: number[] = [];
    for (let e = 0; e < used.length; e++) {
      const p = used[e];
      const i = p % columns;
      const j = (p - i) / columns;
      for (let b = 0; b < kr; b++) {
        const jj = j - (b - centreB);
        if (jj < 0 || jj >= rows) continue;
        for (let a = 0; a < kc; a++) {
          const ii = i - (a - centreA);
          const tap = values[b * kc + a];
          if (tap === 0 || ii < 0 || ii >= columns) continue;
          const q = computedIndex[jj * columns + ii];
          if (q < 0) continue;
          rowList.push(q);
          tapList.push(tap);
        }
      }
      start[e + 1] = rowList.length;
    }
    this.stencilStart = start;
    this.stencilRow = Int32Array.from(rowList);
    this.stencilTap = Float64Array.from(tapList);
  }

  build(mapping: SparseRows, cellCount: number, out: SparseRows): void {
    if (this.stamp.length < cellCount || this.generation > GENERATION_LIMIT) {
      this.stamp = ensureInt32Capacity(this.stamp, cellCount);
      this.stamp.fill(0);
      this.generation = 0;
      this.work = ensureFloat64Capacity(this.work, cellCount);
    }
    const rowCount = this.stencilStart.length - 1;
    out.reset(rowCount, 8 * mapping.entries);
    this.fillRows(mapping, out, rowCount, Math.min(cellCount, this.longestStencil() * longestRow(mapping)));
    sortRows(out);
  }

  /** The most rows of M one used pixel reads. */
  private longestStencil(): number {
    let longest = 0;
    for (let e = 0; e + 1 < this.stencilStart.length; e++) longest = Math.max(longest, this.stencilStart[e + 1] - this.stencilStart[e]);
    return longest;
  }

  /**
   * Fills the rows; `rowBound` is the most entries one row can have. A cell's first touch in a
   * row appends it without a branch (the end advances only when its stamp is new); the work row
   * is left all zero.
   */
  private fillRows(mapping: SparseRows, out: SparseRows, rowCount: number, rowBound: number): void {
    const { stencilStart, stencilRow, stencilTap, stamp, work } = this;
    const mStart = mapping.rowStart, mColumn = mapping.column, mValue = mapping.value;
    let generation = this.generation;
    let end = 0;
    for (let e = 0; e < rowCount; e++) {
      if (out.column.length < end + rowBound) out.reserve(2 * (end + rowBound));
      const column = out.column;
      const start = end;
      generation++;
      for (let s = stencilStart[e]; s < stencilStart[e + 1]; s++) {
        const q = stencilRow[s];
        const tap = stencilTap[s];
        for (let k = mStart[q]; k < mStart[q + 1]; k++) {
          const c = mColumn[k];
          column[end] = c;
          end += stamp[c] === generation ? 0 : 1;
          stamp[c] = generation;
          work[c] += tap * mValue[k];
        }
      }
      const value = out.value;
      for (let k = start; k < end; k++) {
        const c = column[k];
        value[k] = work[c];
        work[c] = 0;
      }
      out.rowStart[e + 1] = end;
    }
    this.generation = generation;
    out.rowCount = rowCount;
  }
}

/** The most entries in one row of `rows`. */
function longestRow(rows: SparseRows): number {
  let longest = 0;
  for (let r = 0; r < rows.rowCount; r++) longest = Math.max(longest, rows.rowStart[r + 1] - rows.rowStart[r]);
  return longest;
}

/** Sorts each row's cells increasing, with their values. */
function sortRows(rows: SparseRows): void {
  const { rowStart, column, value } = rows;
  for (let r = 0; r < rows.rowCount; r++) sortRow(column, value, rowStart[r], rowStart[r + 1]);
}

/** Sorts column[from..to) increasing by insertion, values alongside (rows hold tens of cells). */
function sortRow(column: Int32Array, value: Float64Array, from: number, to: number): void {
  for (let k = from + 1; k < to; k++) {
    const c = column[k];
    const v = value[k];
    let at = k - 1;
    while (at >= from && column[at] > c) {
      column[at + 1] = column[at];
      value[at + 1] = value[at];
      at--;
    }
    column[at + 1] = c;
    value[at + 1] = v;
  }
}
