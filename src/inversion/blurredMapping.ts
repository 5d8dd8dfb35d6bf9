import type { PsfKernel } from '../imaging/psfKernel.js';
import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import type { SparseRows } from './sparseRows.js';

/**
 * The blurred mapping matrix B = P M at the used pixels (Warren & Dye 2003; the PSF applied to
 * each cell's lensed image): row e of B, for used pixel `used[e]`, is the sum over the kernel's
 * taps of the tap times the row of M of the computed pixel it reads, with the convolution and
 * zero boundary of directConvolution. `computedIndex[pixel]` is a pixel's row in M (-1 when not
 * computed: no light). Rows are merged through a dense work row over the cells, and their cells
 * sorted (increasing), so that products over a row can stop at a cell.
 */
export class BlurredMapping {
  private work = new Float64Array(0);
  private slot = new Int32Array(0);

  constructor(
    private readonly columns: number,
    private readonly rows: number,
    private readonly kernel: PsfKernel,
    private readonly used: Int32Array,
    private readonly computedIndex: Int32Array,
  ) {}

  build(mapping: SparseRows, cellCount: number, out: SparseRows): void {
    if (this.slot.length < cellCount) {
      this.slot = ensureInt32Capacity(this.slot, cellCount);
      this.slot.fill(-1);
      this.work = ensureFloat64Capacity(this.work, cellCount);
    }
    out.reset(this.used.length, 8 * mapping.entries);
    const taps = this.kernel.columns * this.kernel.rows;
    this.fillRows(mapping, out, Math.min(cellCount, taps * longestRow(mapping)));
  }

  /** Fills the rows; `rowBound` is the most entries one row can have. */
  private fillRows(mapping: SparseRows, out: SparseRows, rowBound: number): void {
    const { columns, rows, used, computedIndex, slot, work } = this;
    const { columns: kc, rows: kr, values: kernel } = this.kernel;
    const centreA = (kc - 1) / 2, centreB = (kr - 1) / 2;
    const mStart = mapping.rowStart, mColumn = mapping.column, mValue = mapping.value;
    let end = 0;
    for (let e = 0; e < used.length; e++) {
      const p = used[e];
      const i = p % columns;
      const j = (p - i) / columns;
      if (out.column.length < end + rowBound) out.reserve(2 * (end + rowBound));
      const column = out.column;
      const start = end;
      for (let b = 0; b < kr; b++) {
        const jj = j - (b - centreB);
        if (jj < 0 || jj >= rows) continue;
        for (let a = 0; a < kc; a++) {
          const tap = kernel[b * kc + a];
          const ii = i - (a - centreA);
          if (tap === 0 || ii < 0 || ii >= columns) continue;
          const q = computedIndex[jj * columns + ii];
          if (q < 0) continue;
          for (let k = mStart[q]; k < mStart[q + 1]; k++) {
            const c = mColumn[k];
            if (slot[c] < 0) {
              slot[c] = end;
              column[end++] = c;
              work[c] = tap * mValue[k];
            } else work[c] += tap * mValue[k];
          }
        }
      }
      const value = out.value;
      sortRow(column, start, end);
      for (let k = start; k < end; k++) {
        const c = column[k];
        value[k] = work[c];
        slot[c] = -1;
      }
      out.rowStart[e + 1] = end;
    }
    out.rowCount = used.length;
  }
}

/** The most entries in one row of `rows`. */
function longestRow(rows: SparseRows): number {
  let longest = 0;
  for (let r = 0; r < rows.rowCount; r++) longest = Math.max(longest, rows.rowStart[r + 1] - rows.rowStart[r]);
  return longest;
}

/** Sorts column[from..to) increasing by insertion (rows hold tens of cells). */
function sortRow(column: Int32Array, from: number, to: number): void {
  for (let k = from + 1; k < to; k++) {
    const c = column[k];
    let at = k - 1;
    while (at >= from && column[at] > c) {
      column[at + 1] = column[at];
      at--;
    }
    column[at + 1] = c;
  }
}
