import type { PsfKernel } from '../imaging/psfKernel.js';
import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import { GENERATION_LIMIT, SeparableBlur } from './separableBlur.js';
import { SparseRows } from './sparseRows.js';
import { SpreadMemory, spreadBlurModule, type SpreadLists } from './spreadBlurKernel.js';

/**
 * The blurred mapping matrix B = P M at the used pixels (Warren & Dye 2003; the PSF applied to
 * each cell's lensed image): entry (e, c), for used pixel `used[e]`, is the sum over the kernel's
 * taps of the tap times M's entry (computed pixel it reads, c), with the convolution and zero
 * boundary of directConvolution. `computedIndex[pixel]` is a pixel's row in M (-1 when not
 * computed: no light). Which used pixels read each row of M, and with which tap, is fixed by the
 * grid and kernel and listed once (the spread). B^T is built first, one cell at a time: the
 * cell's entries of M (a column of M, a row of M^T) are spread through that list and merged over
 * the used pixels. B is then the transpose of B^T, which leaves each row of B in increasing cell
 * order without a sort (the normal matrix's products stop at a cell, and its dense accumulation
 * walks each row of its triangle in increasing addresses). Building B row by row and sorting
 * each row cost 19 ms on the demo's 1,000-cell mesh; this order costs 11 ms. A separable kernel
 * (the product of its two marginals) builds B^T in SeparableBlur's two one-dimensional passes
 * instead: 8 ms there, and no spread list to make. The one-pass spread runs in WebAssembly where
 * it compiled (spreadBlurKernel.ts): 73 -> 31 ms for the demo's mesh under a 21 x 21 Moffat PSF.
 */
export class BlurredMapping {
  private work = new Float64Array(0);
  /** stamp[e] === generation while used pixel e is in the row of B^T being built. */
  private readonly stamp: Int32Array;
  private generation = 0;
  /**
   * Row q of M is read by used pixels pixel[start[q] ..] with taps tap[..] (what the WebAssembly
   * spread copies), and the longest such list.
   */
  private readonly spreadLists: SpreadLists;
  private readonly longestSpread: number;
  private readonly mt = new SparseRows();
  /** B^T on the way to B when the caller wants only B. */
  private readonly transposeScratch = new SparseRows();

  /** With a separable kernel: the two passes' buffers (null otherwise). */
  private readonly separable: SeparableBlur | null;
  /** The WebAssembly twin of fillTransposeRows: its memory (null until its first call). */
  private spreadMemory: SpreadMemory | null = null;
  /** Whether a kernel that is not separable is spread in WebAssembly ('auto', where it compiled). */
  private readonly spreadRuns: boolean;

  /**
   * `separable`: the kernel as alongX[a] alongY[b] (within the caller's tolerance), or undefined;
   * given, B^T is built in two one-dimensional passes (SeparableBlur). `engine` 'javaScript'
   * keeps the one-pass spread in JavaScript (the twin the WebAssembly spread is tested against).
   */
  constructor(
    columns: number, rows: number, kernel: PsfKernel, used: Int32Array, computedIndex: Int32Array,
    separable?: { readonly alongX: Float64Array; readonly alongY: Float64Array },
    engine: 'auto' | 'javaScript' = 'auto',
  ) {
    this.spreadRuns = engine === 'auto' && spreadBlurModule !== null;
    let computedCount = 0;
    for (let p = 0; p < computedIndex.length; p++) computedCount = Math.max(computedCount, computedIndex[p] + 1);
    this.separable = separable === undefined ? null : new SeparableBlur(columns, rows, separable.alongX, separable.alongY, used, computedIndex, computedCount);
    // The separable passes need no list of readers (it takes a quarter of a second to make).
    const spread = separable === undefined
      ? spreadLists(columns, rows, kernel, used, computedIndex, computedCount)
      : { start: new Int32Array(computedCount + 1), pixel: new Int32Array(0), tap: new Float64Array(0) };
    this.spreadLists = spread;
    let longest = 0;
    for (let q = 0; q + 1 < spread.start.length; q++) longest = Math.max(longest, spread.start[q + 1] - spread.start[q]);
    this.longestSpread = longest;
    this.stamp = new Int32Array(used.length);
    this.work = new Float64Array(used.length);
  }

  /**
   * B into `out` and B^T into `transposeWanted`, for the mapping M of `cellCount` cells; with
   * transposeWanted null, B alone (B^T, where it is made on the way, in a scratch of this object).
   */
  build(mapping: SparseRows, cellCount: number, out: SparseRows, transposeWanted: SparseRows | null): void {
    if (this.generation > GENERATION_LIMIT) {
      this.stamp.fill(0);
      this.generation = 0;
    }
    if (this.separable !== null && this.separable.runsInWasm) {
      this.separable.fillFromMapping(mapping, cellCount, transposeWanted, out);
      return;
    }
    const outTranspose = transposeWanted ?? this.transposeScratch;
    this.mt.transposeOf(mapping, cellCount);
    if (this.separable === null && this.spreadRuns) {
      this.spreadInWasm(outTranspose, cellCount);
    } else {
      outTranspose.reset(cellCount, 8 * mapping.entries);
      if (this.separable !== null) this.separable.fillTransposeRows(this.mt, outTranspose, cellCount);
      else this.fillTransposeRows(outTranspose, cellCount, Math.min(this.stamp.length, this.longestSpread * longestRow(this.mt)));
    }
    out.transposeOf(outTranspose, this.stamp.length);
  }

  /**
   * fillTransposeRows in WebAssembly (spreadBlurKernel.ts, the same rows to the bit): M^T copied
   * into the kernel's memory, the rows of B^T copied out. A memory short of room for the output
   * is replaced by one with twice as much and the call repeated.
   */
  private spreadInWasm(out: SparseRows, cellCount: number): void {
    const mt = this.mt;
    const entries = mt.entries;
    let memory = this.spreadMemory;
    if (memory === null || memory.cells < cellCount || memory.entries < entries) memory = this.spreadRoom(cellCount, entries, 32 * entries, memory);
    for (;;) {
      memory.mtStart.set(mt.rowStart.subarray(0, cellCount + 1));
      memory.mtPixel.set(mt.column.subarray(0, entries));
      memory.mtValue.set(mt.value.subarray(0, entries));
      if (memory.generation > GENERATION_LIMIT) {
        memory.stamp.fill(0);
        memory.generation = 0;
      }
      if (memory.fill(cellCount) === cellCount) break;
      memory = this.spreadRoom(cellCount, entries, 2 * memory.out, memory);
    }
    this.spreadMemory = memory;
    out.copyFrom(memory.outStart, memory.outColumn, memory.outValue, cellCount);
  }

  /** A fresh spread memory with room for these counts (and at least what `old` had). */
  private spreadRoom(cells: number, entries: number, out: number, old: SpreadMemory | null): SpreadMemory {
    return new SpreadMemory(this.spreadLists, this.stamp.length, this.longestSpread, {
      cells: Math.max(cells, old?.cells ?? 0, 16),
      entries: Math.max(Math.ceil(1.25 * entries), old?.entries ?? 0, 16),
      out: Math.max(out, old?.out ?? 0, 1 << 16),
    });
  }

  /**
   * Fills the rows of B^T; `rowBound` is the most entries one row can have. A pixel's first
   * touch in a row appends it without a branch (the end advances only when its stamp is new);
   * the work row is left all zero.
   */
  private fillTransposeRows(out: SparseRows, cellCount: number, rowBound: number): void {
    const { start: spreadStart, pixel: spreadPixel, tap: spreadTap } = this.spreadLists;
    const { stamp, work } = this;
    const mtStart = this.mt.rowStart, mtPixel = this.mt.column, mtValue = this.mt.value;
    let generation = this.generation;
    let end = 0;
    for (let c = 0; c < cellCount; c++) {
      if (out.column.length < end + rowBound) out.reserve(2 * (end + rowBound));
      const column = out.column;
      const start = end;
      generation++;
      for (let k = mtStart[c]; k < mtStart[c + 1]; k++) {
        const q = mtPixel[k];
        const v = mtValue[k];
        for (let s = spreadStart[q]; s < spreadStart[q + 1]; s++) {
          const e = spreadPixel[s];
          column[end] = e;
          end += stamp[e] === generation ? 0 : 1;
          stamp[e] = generation;
          work[e] += spreadTap[s] * v;
        }
      }
      const value = out.value;
      for (let k = start; k < end; k++) {
        const e = column[k];
        value[k] = work[e];
        work[e] = 0;
      }
      out.rowStart[c + 1] = end;
    }
    this.generation = generation;
    out.rowCount = cellCount;
  }
}

/** The most entries in one row of `rows`. */
function longestRow(rows: SparseRows): number {
  let longest = 0;
  for (let r = 0; r < rows.rowCount; r++) longest = Math.max(longest, rows.rowStart[r + 1] - rows.rowStart[r]);
  return longest;
}

/** For each computed row q of M, the used pixels that read it through the kernel and with which tap (in order of used pixel). */
function spreadLists(
  columns: number, rows: number, kernel: PsfKernel, used: Int32Array, computedIndex: Int32Array, computedCount: number,
): { start: Int32Array; pixel: Int32Array; tap: Float64Array } {
  const { columns: kc, rows: kr, values } = kernel;
  const centreA = (kc - 1) / 2, centreB = (kr - 1) / 2;
  const readers: Array<Array<[number, number]>> = Array.from({ length: computedCount }, () => []);
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
        if (q >= 0) readers[q].push([e, tap]);
      }
    }
  }
  const start = new Int32Array(computedCount + 1);
  readers.forEach((list, q) => { start[q + 1] = start[q] + list.length; });
  const flat = readers.flat();
  return { start, pixel: Int32Array.from(flat, ([e]) => e), tap: Float64Array.from(flat, ([, tap]) => tap) };
}
