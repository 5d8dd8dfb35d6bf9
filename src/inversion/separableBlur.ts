import { memoryWithRegions } from '../numeric/wasm/wasmMemory.js';
import { separableBlurModule, type SeparableBlurFill, type SparseTranspose } from './separableBlurKernel.js';
import type { SparseRows } from './sparseRows.js';

/** Stamps restart from zero before the generation count could overflow an Int32. */
export const GENERATION_LIMIT = 2 ** 30;

/**
 * The rows of B^T (each cell's lensed image convolved with the PSF, at the used pixels) for a
 * separable kernel K(a, b) = alongX[a] alongY[b], in two one-dimensional passes instead of one
 * pass over every tap: the cell's entries of M are spread along x into an intermediate image,
 * whose touched pixels are then spread along y onto the used pixels. The convolution and zero
 * boundary are those of directConvolution, on an image padded by the kernel's half-sizes so no
 * pass tests an edge. A 7 x 7 kernel costs 14 multiply-adds per entry of M and per intermediate
 * pixel instead of 49 per entry. Each pass lists the pixels it touches in order of first touch
 * (stamps), and leaves its work image all zero. Where WebAssembly is available,
 * fillFromMapping runs the whole step there (separableBlurKernel.ts): M copied into the kernel's
 * memory, transposed, the two passes, B^T transposed into B, the same operations in the same
 * order as the JavaScript twin (transposeOf, fillTransposeRows, transposeOf).
 */
export class SeparableBlur {
  private readonly width: number;
  private readonly alongX: Float64Array;
  private readonly alongY: Float64Array;
  /** Padded index of the first pixel of each M row's x-window in the intermediate image. */
  private readonly xStart: Int32Array;
  /** Used-pixel index of each padded pixel, -1 for the others. */
  private readonly usedAt: Int32Array;
  private readonly across: Float64Array;
  private readonly down: Float64Array;
  private readonly acrossStamp: Int32Array;
  private readonly downStamp: Int32Array;
  private acrossList: Int32Array;
  private downList: Int32Array;
  private generation = 0;
  /** The WebAssembly twin's memory (null until its first call). */
  private wasm: BlurMemory | null = null;
  private readonly usedCount: number;
  /** Whether fillFromMapping can run (WebAssembly is available). */
  readonly runsInWasm = separableBlurModule !== null;

  constructor(
    columns: number, rows: number, alongX: Float64Array, alongY: Float64Array,
    used: Int32Array, computedIndex: Int32Array, computedCount: number,
  ) {
    this.usedCount = used.length;
    const halfX = (alongX.length - 1) / 2, halfY = (alongY.length - 1) / 2;
    const width = columns + 2 * halfX;
    const size = width * (rows + 2 * halfY);
    this.width = width;
    this.alongX = Float64Array.from(alongX);
    this.alongY = Float64Array.from(alongY);
    // Tap a carries pixel (i, j) to (i + a - halfX, j) of the intermediate image, padded index
    // (j + halfY) width + i + a; tap b carries an intermediate pixel at padded t to the output
    // pixel t + (b - halfY) width.
    this.xStart = new Int32Array(computedCount);
    for (let p = 0; p < computedIndex.length; p++) {
      const q = computedIndex[p];
      if (q < 0) continue;
      const i = p % columns;
      this.xStart[q] = ((p - i) / columns + halfY) * width + i;
    }
    this.usedAt = new Int32Array(size).fill(-1);
    used.forEach((p, e) => {
      const i = p % columns;
      this.usedAt[((p - i) / columns + halfY) * width + i + halfX] = e;
    });
    this.across = new Float64Array(size);
    this.down = new Float64Array(size);
    this.acrossStamp = new Int32Array(size);
    this.downStamp = new Int32Array(size);
    this.acrossList = new Int32Array(1024);
    this.downList = new Int32Array(1024);
  }

  /**
   * B^T into `outTranspose` (unless null) and B into `out` for the mapping M (computed pixels x
   * cellCount cells), all in WebAssembly: M copied in, transposed there (SparseRows.transposeOf's
   * counting sort), the two passes per cell, B^T transposed there; B^T copied out, and `out`
   * given B as views of the kernel's memory (SparseRows.viewOf: valid until the next call). The
   * rows are those of transposeOf, fillTransposeRows and transposeOf to the bit. Only when
   * runsInWasm.
   */
  fillFromMapping(mapping: SparseRows, cellCount: number, outTranspose: SparseRows | null, out: SparseRows): void {
    const computed = this.xStart.length;
    const entries = mapping.rowStart[computed];
    const kx = this.alongX.length, ky = this.alongY.length;
    let memory = this.wasm;
    if (memory === null || !memory.holds(cellCount, entries, 0, 0, 8 * entries)) memory = this.wasm = this.allocate(cellCount, entries, 0, 0, 8 * entries, memory);
    for (;;) {
      rowsIn(mapping, computed, memory.m);
      memory.transposeMapping(cellCount);
      let longest = 0;
      const mtStart = memory.mt.start;
      for (let c = 0; c < cellCount; c++) longest = Math.max(longest, mtStart[c + 1] - mtStart[c]);
      // A cell's passes list at most longest kx and longest kx ky pixels, and write at most the
      // latter entries; the output starts at 8 entries per entry of M (about twice the demo's).
      const across = longest * kx, down = longest * kx * ky, outNeeded = Math.max(8 * entries, down);
      if (!memory.holds(cellCount, entries, across, down, outNeeded)) {
        memory = this.wasm = this.allocate(cellCount, entries, across, down, outNeeded, memory);
        continue;
      }
      if (memory.generation > GENERATION_LIMIT) memory.resetStamps();
      memory.bt.start[0] = 0;
      if (memory.fill(cellCount) === cellCount) break;
      // The output ran out of room: a memory with twice as much, and the call again from its start.
      memory = this.wasm = this.allocate(cellCount, entries, across, down, 2 * memory.room.out, memory);
    }
    memory.transposeOutput(cellCount);
    if (outTranspose !== null) rowsOut(memory.bt, cellCount, outTranspose);
    out.viewOf(memory.b.start, memory.b.column, memory.b.value, this.usedCount);
  }

  /** A fresh memory with room for these counts (and at least what `old` had), the fixed tables copied in. */
  private allocate(cells: number, entries: number, across: number, down: number, out: number, old: BlurMemory | null): BlurMemory {
    const grow = (wanted: number, had: number | undefined): number => Math.max(wanted, had ?? 0, 16);
    return new BlurMemory(this.tables, {
      cells: grow(cells, old?.room.cells), entries: grow(Math.ceil(1.25 * entries), old?.room.entries),
      across: grow(across, old?.room.across), down: grow(down, old?.room.down), out: grow(out, old?.room.out),
    });
  }

  /** The fixed tables and sizes a BlurMemory copies. */
  private get tables(): BlurTables {
    return { xStart: this.xStart, usedAt: this.usedAt, alongX: this.alongX, alongY: this.alongY, width: this.width, size: this.across.length, usedCount: this.usedCount };
  }

  /** The rows of B^T into `out` (reset by the caller), for M^T `mt` of `cellCount` rows, in JavaScript. */
  fillTransposeRows(mt: SparseRows, out: SparseRows, cellCount: number): void {
    if (this.generation > GENERATION_LIMIT) {
      this.acrossStamp.fill(0);
      this.downStamp.fill(0);
      this.generation = 0;
    }
    const kx = this.alongX.length, ky = this.alongY.length;
    let end = 0;
    for (let c = 0; c < cellCount; c++) {
      const generation = ++this.generation;
      const first = mt.rowStart[c], last = mt.rowStart[c + 1];
      if (this.acrossList.length < (last - first) * kx) this.acrossList = new Int32Array(2 * (last - first) * kx);
      const touched = this.spreadAcross(mt, first, last, generation);
      if (this.downList.length < touched * ky) this.downList = new Int32Array(2 * touched * ky);
      const reached = this.spreadDown(touched, generation);
      if (out.column.length < end + reached) out.reserve(2 * (end + reached));
      end = this.harvest(reached, out, end);
      out.rowStart[c + 1] = end;
    }
    out.rowCount = cellCount;
  }

  /** Entries first .. last - 1 of M^T spread along x; returns how many intermediate pixels they touched. */
  private spreadAcross(mt: SparseRows, first: number, last: number, generation: number): number {
    const { xStart, alongX, across, acrossStamp, acrossList } = this;
    const pixel = mt.column, value = mt.value;
    const kx = alongX.length;
    let touched = 0;
    for (let k = first; k < last; k++) {
      const v = value[k];
      const start = xStart[pixel[k]];
      for (let a = 0; a < kx; a++) {
        const t = start + a;
        acrossList[touched] = t;
        touched += acrossStamp[t] === generation ? 0 : 1;
        acrossStamp[t] = generation;
        across[t] += alongX[a] * v;
      }
    }
    return touched;
  }

  /** The touched intermediate pixels spread along y (and cleared); returns how many output pixels they reached. */
  private spreadDown(touched: number, generation: number): number {
    const { alongY, across, down, downStamp, downList, acrossList, width } = this;
    const ky = alongY.length;
    const back = ((ky - 1) / 2) * width;
    let reached = 0;
    for (let n = 0; n < touched; n++) {
      const t = acrossList[n];
      const u = across[t];
      across[t] = 0;
      let p = t - back;
      for (let b = 0; b < ky; b++, p += width) {
        downList[reached] = p;
        reached += downStamp[p] === generation ? 0 : 1;
        downStamp[p] = generation;
        down[p] += alongY[b] * u;
      }
    }
    return reached;
  }

  /** The reached output pixels that are used go into row entries from `end` (and all are cleared); returns the new end. */
  private harvest(reached: number, out: SparseRows, end: number): number {
    const { down, downList, usedAt } = this;
    const column = out.column, value = out.value;
    for (let n = 0; n < reached; n++) {
      const p = downList[n];
      const e = usedAt[p];
      const v = down[p];
      down[p] = 0;
      if (e < 0) continue;
      column[end] = e;
      value[end++] = v;
    }
    return end;
  }
}

/** What a BlurMemory copies from its SeparableBlur: the fixed tables, the padded width and image size. */
interface BlurTables {
  readonly xStart: Int32Array;
  readonly usedAt: Int32Array;
  readonly alongX: Float64Array;
  readonly alongY: Float64Array;
  readonly width: number;
  readonly size: number;
  readonly usedCount: number;
}

/** Room of a BlurMemory: cells, entries of M^T, the two lists, and output entries. */
interface BlurNeeds {
  readonly cells: number;
  readonly entries: number;
  readonly across: number;
  readonly down: number;
  readonly out: number;
}

/**
 * The WebAssembly twin's memory: the fixed tables (xStart, usedAt, the two marginals), the work
 * images with their stamps and lists, M^T and the output, one region each, and the kernel bound
 * to it. A call that needs more room gets a new one (stamps restart at 0).
 */
class BlurMemory {
  readonly room: BlurNeeds;
  generation = 0;
  /** M (computed pixels x cells), M^T, B^T (the kernel's output) and B, in the kernel's memory. */
  readonly m: RowsRegion;
  readonly mt: RowsRegion;
  readonly bt: RowsRegion;
  readonly b: RowsRegion;
  private readonly stamps: Int32Array[];
  private readonly kernel: SeparableBlurFill;
  private readonly transpose: SparseTranspose;
  private readonly computedCount: number;
  private readonly usedCount: number;
  private readonly addresses: number[];
  private readonly kx: number;
  private readonly ky: number;
  private readonly width: number;

  constructor(tables: BlurTables, room: BlurNeeds) {
    this.room = room;
    const { xStart, usedAt, alongX, alongY, width, size } = tables;
    // The fixed tables, the work images, their stamps and lists, then four compressed-row matrices.
    const sizes = [
      4 * xStart.length, 4 * size, 8 * alongX.length, 8 * alongY.length, 8 * size, 8 * size, 4 * size, 4 * size, 4 * room.across, 4 * room.down,
      ...rowsSizes(room.cells, room.entries), ...rowsSizes(room.cells, room.out), ...rowsSizes(xStart.length, room.entries), ...rowsSizes(tables.usedCount, room.out),
    ];
    const { memory, starts } = memoryWithRegions(sizes);
    const buffer = memory.buffer;
    new Int32Array(buffer, starts[0], xStart.length).set(xStart);
    new Int32Array(buffer, starts[1], size).set(usedAt);
    new Float64Array(buffer, starts[2], alongX.length).set(alongX);
    new Float64Array(buffer, starts[3], alongY.length).set(alongY);
    this.stamps = [new Int32Array(buffer, starts[6], size), new Int32Array(buffer, starts[7], size)];
    this.mt = rowsRegion(buffer, starts, 10, room.cells, room.entries);
    this.bt = rowsRegion(buffer, starts, 13, room.cells, room.out);
    this.m = rowsRegion(buffer, starts, 16, xStart.length, room.entries);
    this.b = rowsRegion(buffer, starts, 19, tables.usedCount, room.out);
    const exports = new WebAssembly.Instance(separableBlurModule!, { env: { memory } }).exports;
    this.kernel = exports.fillRows as SeparableBlurFill;
    this.transpose = exports.transpose as SparseTranspose;
    this.computedCount = xStart.length;
    this.usedCount = tables.usedCount;
    this.addresses = starts;
    this.kx = alongX.length;
    this.ky = alongY.length;
    this.width = width;
  }

  holds(cells: number, entries: number, across: number, down: number, out: number): boolean {
    const r = this.room;
    return cells <= r.cells && entries <= r.entries && across <= r.across && down <= r.down && out <= r.out;
  }

  resetStamps(): void {
    for (const stamp of this.stamps) stamp.fill(0);
    this.generation = 0;
  }

  /** M^T (cellCount rows) from M. */
  transposeMapping(cellCount: number): void {
    const { m, mt } = this;
    this.transpose(m.startAt, m.columnAt, m.valueAt, this.computedCount, cellCount, mt.startAt, mt.columnAt, mt.valueAt);
  }

  /** B (used-pixel rows) from B^T (cellCount rows). */
  transposeOutput(cellCount: number): void {
    const { bt, b } = this;
    this.transpose(bt.startAt, bt.columnAt, bt.valueAt, cellCount, this.usedCount, b.startAt, b.columnAt, b.valueAt);
  }

  /** Runs the kernel over cells 0 .. cellCount - 1; returns the first cell it could not hold. */
  fill(cellCount: number): number {
    const s = this.addresses, { mt, bt } = this;
    const back = ((this.ky - 1) / 2) * this.width;
    const done = this.kernel(
      mt.startAt, mt.columnAt, mt.valueAt, s[0], s[1], s[2], this.kx, s[3], this.ky, this.width, back, s[4], s[5], s[6], s[7], s[8], s[9],
      bt.startAt, bt.columnAt, bt.valueAt, 0, cellCount, this.generation, this.room.out,
    );
    this.generation += done;
    return done;
  }
}

/** A compressed-row matrix in a kernel's memory: its three arrays and their byte addresses. */
interface RowsRegion {
  readonly start: Int32Array<ArrayBuffer>;
  readonly column: Int32Array<ArrayBuffer>;
  readonly value: Float64Array<ArrayBuffer>;
  readonly startAt: number;
  readonly columnAt: number;
  readonly valueAt: number;
}

/** Byte lengths of the three regions of a matrix of `rows` rows and `entries` entries. */
function rowsSizes(rows: number, entries: number): number[] {
  return [4 * (rows + 1), 4 * entries, 8 * entries];
}

/** The matrix whose regions are starts[first .. first + 2] (laid out by rowsSizes). */
function rowsRegion(buffer: ArrayBuffer, starts: number[], first: number, rows: number, entries: number): RowsRegion {
  const [startAt, columnAt, valueAt] = starts.slice(first, first + 3);
  return {
    start: new Int32Array(buffer, startAt, rows + 1), column: new Int32Array(buffer, columnAt, entries), value: new Float64Array(buffer, valueAt, entries),
    startAt, columnAt, valueAt,
  };
}

// The copies in and out use the engine's block copy of a subarray view: three small views per
// copy against a loop of element copies, which cost 0.7 ms more per
// likelihood on the demo's mesh (blur stage 3.9 against 3.1 ms).

/** The first `rows` rows of `from` into the region (which has room for them). */
function rowsIn(from: SparseRows, rows: number, to: RowsRegion): void {
  const entries = from.rowStart[rows];
  to.start.set(from.rowStart.subarray(0, rows + 1));
  to.column.set(from.column.subarray(0, entries));
  to.value.set(from.value.subarray(0, entries));
}

/** The region's first `rows` rows into `to` (reset here to hold them). */
function rowsOut(from: RowsRegion, rows: number, to: SparseRows): void {
  to.copyFrom(from.start, from.column, from.value, rows);
}
