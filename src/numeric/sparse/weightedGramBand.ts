import { WASM_TYPE, compileWasmModule, element, emitter, integer, op } from '../wasm/wasmModuleBytes.js';
import { memoryWithRegions, withHeadroom } from '../wasm/wasmMemory.js';
import { ensureFloat64Capacity } from './ensureCapacity.js';
import type { SymmetricCsr } from './symmetricCsr.js';

/** Compressed sparse rows whose columns increase along each row (rows rowStart[r] .. rowStart[r + 1] - 1). */
export interface SortedSparseRows {
  readonly rowCount: number;
  readonly rowStart: Int32Array;
  readonly column: Int32Array;
  readonly value: Float64Array;
}

/**
 * Where entry (a, b), b <= a, of a lower triangle sits in a band of `band` columns stored row
 * by row: row a holds columns a - band + 1 .. a at increasing addresses, the diagonal last.
 */
export function bandOffset(a: number, b: number, band: number): number {
  return a * (band - 1) + b + band - 1;
}

/**
 * The band that holds every product of two entries of one row: one more than the largest
 * distance between the first and last column of a row.
 */
export function rowSpan(rows: SortedSparseRows): number {
  let span = 1;
  for (let r = 0; r < rows.rowCount; r++) {
    const from = rows.rowStart[r], to = rows.rowStart[r + 1];
    if (to > from) span = Math.max(span, rows.column[to - 1] - rows.column[from] + 1);
  }
  return span;
}

/**
 * The accumulation of G = sum_e w_e b_e b_e^T (the Gram matrix B^T W B of the rows b_e of B,
 * the data term of a linear inversion's normal matrix, Warren & Dye 2003) into a dense band of
 * its lower triangle, row by row of B, each pair of a row's entries once. A WebAssembly
 * function (scalar f64): on the demo's meshes it runs 2.7 times as fast as the JavaScript loop,
 * which V8 leaves with a bounds check and a reload of every array per product. It takes a row's
 * entries x two at a time, so that each entry y read serves both products (x, y) and (x + 1, y);
 * every band entry still receives one product per row of B, in the order of the rows, so the
 * sums are those of the plain loop to the bit. Parameters (i32, byte addresses): rowStart,
 * column, value, w, band storage, rows, band - 1.
 */
function accumulateBody(): number[] {
  const [rowStart, column, value, weight, dense, rows, bandLess, e, x, y, from, to, rowX, scaled, at, rowNext, columnY, scaledNext, valueY, next] =
    [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19];
  const body: number[] = [];
  const emit = emitter(body);
  const addressOf = (base: number, index: number, shift: number): number[] => [...op.localGet(base), ...op.localGet(index), ...op.i32Const(shift), ...op.i32Shl, ...op.i32Add];
  // scaledLocal = w[e] * value[index]; rowLocal = address of (column[index], 0) in the band.
  const rowOf = (index: number, scaledLocal: number, rowLocal: number): number[][] => [
    addressOf(weight, e, 3), op.f64Load(0), addressOf(value, index, 3), op.f64Load(0), op.f64Mul, op.localSet(scaledLocal),
    addressOf(column, index, 2), op.i32Load(0), op.localGet(bandLess), op.i32Mul, op.localGet(bandLess), op.i32Add, op.i32Const(3), op.i32Shl,
    op.localGet(dense), op.i32Add, op.localSet(rowLocal),
  ];
  // band[rowLocal + offsetLocal] += scaledLocal * factor (factor: instructions leaving an f64).
  const addProduct = (rowLocal: number, offset: number[], scaledLocal: number, factor: number[]): number[][] => [
    op.localGet(rowLocal), offset, op.i32Add, op.localSet(at),
    op.localGet(at), op.localGet(at), op.f64Load(0), op.localGet(scaledLocal), factor, op.f64Mul, op.f64Add, op.f64Store(0),
  ];
  const increment = (local: number, by: number): number[][] => [op.localGet(local), op.i32Const(by), op.i32Add, op.localSet(local)];
  emit(op.i32Const(0), op.localSet(e));
  emit(op.block, op.loop, op.localGet(e), op.localGet(rows), op.i32GeS, op.brIf(1));
  emit(addressOf(rowStart, e, 2), op.i32Load(0), op.localSet(from), addressOf(rowStart, e, 2), op.i32Load(4), op.localSet(to));
  emit(op.localGet(from), op.localSet(x));
  // Pairs x, next = x + 1 while both are in the row.
  emit(op.block, op.loop, op.localGet(x), op.i32Const(1), op.i32Add, op.localSet(next), op.localGet(next), op.localGet(to), op.i32GeS, op.brIf(1));
  emit(...rowOf(x, scaled, rowX), ...rowOf(next, scaledNext, rowNext));
  emit(op.localGet(from), op.localSet(y));
  emit(op.block, op.loop, op.localGet(y), op.localGet(x), op.i32GtS, op.brIf(1));
  emit(addressOf(column, y, 2), op.i32Load(0), op.i32Const(3), op.i32Shl, op.localSet(columnY), addressOf(value, y, 3), op.f64Load(0), op.localSet(valueY));
  emit(...addProduct(rowX, op.localGet(columnY), scaled, op.localGet(valueY)), ...addProduct(rowNext, op.localGet(columnY), scaledNext, op.localGet(valueY)));
  emit(...increment(y, 1), op.br(0), op.end, op.end);
  // The pair's last product, (next, next).
  emit(...addProduct(rowNext, [...addressOf(column, next, 2), ...op.i32Load(0), ...op.i32Const(3), ...op.i32Shl], scaledNext, [...addressOf(value, next, 3), ...op.f64Load(0)]));
  emit(...increment(x, 2), op.br(0), op.end, op.end);
  // A last entry x without a partner.
  emit(op.block, op.localGet(x), op.localGet(to), op.i32GeS, op.brIf(0));
  emit(...rowOf(x, scaled, rowX), op.localGet(from), op.localSet(y));
  emit(op.block, op.loop, op.localGet(y), op.localGet(x), op.i32GtS, op.brIf(1));
  emit(...addProduct(rowX, [...addressOf(column, y, 2), ...op.i32Load(0), ...op.i32Const(3), ...op.i32Shl], scaled, [...addressOf(value, y, 3), ...op.f64Load(0)]));
  emit(...increment(y, 1), op.br(0), op.end, op.end, op.end);
  emit(...increment(e, 1), op.br(0), op.end, op.end);
  return body;
}

/**
 * compactBandRows as a WebAssembly function, the same operations in the same order: per row j
 * from `first`, hScale H_jk added into the band, then its entries from column max(0, j - band +
 * 1) to j read in order, each that is not 0 appended (column, value) and cleared. It stops
 * before a row that might not fit the `capacity` entries of the output and returns that row
 * (cellCount when all are done); outStart[j + 1] = offset + the entries written so far.
 * Parameters: dense, band - 1, first, cellCount, H's row starts, columns and values (i32 byte
 * addresses), hScale (f64), the output's row starts, columns and values (byte addresses),
 * offset, capacity; then i32 j, k, base, c, end, at and f64 v.
 */
function compactBody(): number[] {
  const [dense, bandLess, first, cellCount, hStart, hColumn, hValue, hScale, outStart, outColumn, outValue, offset, capacity] =
    [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
  const [j, k, base, c, end, at, v] = [13, 14, 15, 16, 17, 18, 19];
  const body: number[] = [];
  const emit = emitter(body);
  const get = op.localGet, set = op.localSet;
  const { at: address, i32At } = element;
  // The row's first column, max(0, j - (band - 1)).
  const firstColumn = [...integer.minus(get(j), get(bandLess)), ...op.i32Const(0), ...get(j), ...get(bandLess), ...op.i32GeS, ...op.select];
  emit(get(first), set(j), op.i32Const(0), set(end));
  emit(op.block, op.loop, get(j), get(cellCount), op.i32GeS, op.brIf(1));
  // Stop unless j - first column + 1 more entries fit.
  emit(get(end), get(j), op.i32Add, op.i32Const(1), op.i32Add, firstColumn, op.i32Sub, get(capacity), op.i32GtS, op.brIf(1));
  emit(address(dense, [...get(j), ...get(bandLess), ...op.i32Mul, ...get(bandLess), ...op.i32Add], 3), set(base));
  emit(i32At(hStart, get(j)), set(k));
  emit(op.block, op.loop, get(k), i32At(hStart, integer.plus(get(j), op.i32Const(1))), op.i32GeS, op.brIf(1));
  emit(address(base, i32At(hColumn, get(k)), 3), set(at));
  emit(get(at), get(at), op.f64Load(0), get(hScale), element.f64At(hValue, get(k)), op.f64Mul, op.f64Add, op.f64Store(0));
  emit(integer.increment(k), op.br(0), op.end, op.end);
  emit(firstColumn, set(c));
  emit(op.block, op.loop, get(c), get(j), op.i32GtS, op.brIf(1));
  emit(address(base, get(c), 3), set(at), get(at), op.f64Load(0), set(v));
  emit(get(v), op.f64Const(0), op.f64Eq, op.i32Eqz, op.if);
  emit(address(outColumn, get(end), 2), get(c), op.i32Store(0));
  emit(address(outValue, get(end), 3), get(v), op.f64Store(0));
  emit(get(at), op.f64Const(0), op.f64Store(0), integer.increment(end));
  emit(op.end, integer.increment(c), op.br(0), op.end, op.end);
  emit(address(outStart, integer.plus(get(j), op.i32Const(1)), 2), integer.plus(get(offset), get(end)), op.i32Store(0));
  emit(integer.increment(j), op.br(0), op.end, op.end);
  emit(get(j));
  return body;
}

/**
 * projectRows as a WebAssembly function, the same operations in the same order: for each row e
 * of B and each of its entries (e, c, v), out[a cellCount + c] += weighted[a rows + e] v for a =
 * 0 .. count - 1 (out zeroed by the caller). Parameters (i32; arrays as byte addresses):
 * rowStart, column, value, rows, weighted, count, out, cellCount; then i32 e, k, a, c, at, pw and
 * f64 v.
 */
function projectBody(): number[] {
  const [rowStart, column, value, rows, weighted, count, out, cellCount, e, k, a, c, at, pw, v] = Array.from({ length: 15 }, (_, i) => i);
  const body: number[] = [];
  const emit = emitter(body);
  const get = op.localGet, set = op.localSet;
  const { at: address, i32At } = element;
  emit(op.i32Const(0), set(e));
  emit(op.block, op.loop, get(e), get(rows), op.i32GeS, op.brIf(1));
  emit(i32At(rowStart, get(e)), set(k));
  emit(op.block, op.loop, get(k), i32At(rowStart, integer.plus(get(e), op.i32Const(1))), op.i32GeS, op.brIf(1));
  emit(i32At(column, get(k)), set(c), element.f64At(value, get(k)), set(v));
  emit(address(out, get(c), 3), set(at), address(weighted, get(e), 3), set(pw), op.i32Const(0), set(a));
  emit(op.block, op.loop, get(a), get(count), op.i32GeS, op.brIf(1));
  emit(get(at), get(at), op.f64Load(0), get(pw), op.f64Load(0), get(v), op.f64Mul, op.f64Add, op.f64Store(0));
  emit(get(at), get(cellCount), op.i32Const(3), op.i32Shl, op.i32Add, set(at));
  emit(get(pw), get(rows), op.i32Const(3), op.i32Shl, op.i32Add, set(pw));
  emit(integer.increment(a), op.br(0), op.end, op.end);
  emit(integer.increment(k), op.br(0), op.end, op.end);
  emit(integer.increment(e), op.br(0), op.end, op.end);
  return body;
}

const I32 = WASM_TYPE.i32;
const F64 = WASM_TYPE.f64;

/** The compiled module, or null where WebAssembly is not available (the plain loops run instead). */
const compiled = compileWasmModule({
  types: [
    [[I32, I32, I32, I32, I32, I32, I32], []], [[I32, I32, I32, I32, I32, I32, I32, F64, I32, I32, I32, I32, I32], [I32]],
    [[I32, I32, I32, I32, I32, I32, I32, I32], []],
  ],
  functions: [
    { type: 0, locals: [[6, I32], [1, F64], [3, I32], [2, F64], [1, I32]], body: accumulateBody() },
    { type: 1, locals: [[6, I32], [1, F64]], body: compactBody() },
    { type: 2, locals: [[6, I32], [1, F64]], body: projectBody() },
  ],
  exports: [['accumulate', 0], ['compact', 1], ['project', 2]],
});

type Accumulate = (rowStart: number, column: number, value: number, w: number, dense: number, rows: number, bandLess: number) => void;
type Project = (rowStart: number, column: number, value: number, rows: number, weighted: number, count: number, out: number, cellCount: number) => void;
type Compact = (
  dense: number, bandLess: number, first: number, cellCount: number, hStart: number, hColumn: number, hValue: number, hScale: number,
  outStart: number, outColumn: number, outValue: number, offset: number, capacity: number,
) => number;

/** Entries the compacted rows are written in at a time (at least the band, so that every chunk holds a row). */
const COMPACT_CHUNK = 1 << 18;

/** Compressed lower rows that compactRows fills: `grow(entries)` makes room for that many entries (keeping those written), then the arrays are read again. */
export interface GrowableLowerRows {
  readonly rowStart: Int32Array;
  readonly column: Int32Array;
  readonly value: Float64Array;
  grow(entries: number): void;
}

/**
 * A dense band for G = B^T W B and the kernels that fill and read it. `accumulate` copies B and
 * w into the kernel's memory (the engine's block copies of subarray views), adds G's lower
 * triangle into the band, and returns the band (bandOffset layout; the array may be longer than
 * cellCount * band). Then either the caller reads it and leaves it all zero again, or
 * `compactRows` adds hScale H and reads its nonzeros out row by row, clearing it (it is zero the
 * first time and after growth); `project` gives B^T W v for weighted vectors W v from the same
 * copy of B. The memory and its views are made when a call needs more room than they have and
 * reused otherwise, so a call allocates nothing. With engine 'javaScript', or without
 * WebAssembly, the same operations run as plain loops.
 */
export class WeightedGramBand {
  private accumulateKernel: Accumulate | null = null;
  private compactKernel: Compact | null = null;
  private projectKernel: Project | null = null;
  /** B's row count in the last accumulate. */
  private rows = 0;
  /** Views of the kernel's memory: the band, B's row starts, columns and values, w, H's and the output's row starts, columns and values. */
  private band = new Float64Array(0);
  private rowStart = new Int32Array(0);
  private column = new Int32Array(0);
  private value = new Float64Array(0);
  private weight = new Float64Array(0);
  private hStart = new Int32Array(0);
  private hColumn = new Int32Array(0);
  private hValue = new Float64Array(0);
  private outStart = new Int32Array(0);
  private outColumn = new Int32Array(0);
  private outValue = new Float64Array(0);
  /** The weighted vectors and their projections (project). */
  private weighted = new Float64Array(0);
  private projected = new Float64Array(0);
  /** The band of the plain loops, and the B they last read. */
  private plainBand = new Float64Array(0);
  private plainRows: SortedSparseRows | null = null;
  private plainProjected = new Float64Array(0);

  constructor(readonly engine: 'auto' | 'javaScript' = 'auto') {}

  /** Whether the kernels run (else the plain loops). */
  private get inWasm(): boolean {
    return this.engine === 'auto' && compiled !== null;
  }

  /**
   * `hEntries` and `projections`: the room compactRows (H's entries) and project (its vectors)
   * will need after this call, so that they need no new memory.
   */
  accumulate(b: SortedSparseRows, w: Float64Array, cellCount: number, band: number, hEntries = 0, projections = 0): Float64Array {
    if (!this.inWasm) return this.accumulatePlain(b, w, cellCount, band);
    const rows = b.rowCount;
    const entries = b.rowStart[rows];
    if (cellCount * band > this.band.length || rows + 1 > this.rowStart.length || entries > this.column.length
      || cellCount + 1 > this.hStart.length || hEntries > this.hColumn.length || band > this.outColumn.length
      || projections * rows > this.weighted.length || projections * cellCount > this.projected.length) {
      this.reserve(cellCount, band, rows, entries, hEntries, projections);
    }
    this.rows = rows;
    this.rowStart.set(b.rowStart.subarray(0, rows + 1));
    this.column.set(b.column.subarray(0, entries));
    this.value.set(b.value.subarray(0, entries));
    this.weight.set(w.subarray(0, rows));
    this.accumulateKernel!(this.rowStart.byteOffset, this.column.byteOffset, this.value.byteOffset, this.weight.byteOffset, this.band.byteOffset, rows, band - 1);
    return this.band;
  }

  /**
   * After `accumulate` (with room for h's entries): adds hScale H (cellCount rows) into the band
   * and writes the band's nonzeros as rows 0 .. cellCount - 1 of `out` (compactBandRows), leaving
   * the band all zero. Returns out.rowStart[cellCount], the entries written.
   */
  compactRows(h: SymmetricCsr, hScale: number, cellCount: number, band: number, out: GrowableLowerRows): number {
    if (!this.inWasm) return compactBandRows(this.plainBand, band, h, hScale, cellCount, out);
    const hEntries = h.rowStart[cellCount];
    if (hEntries > this.hColumn.length || cellCount + 1 > this.hStart.length) throw new RangeError('Gram band: accumulate was not given room for H');
    this.hStart.set(h.rowStart.subarray(0, cellCount + 1));
    this.hColumn.set(h.column.subarray(0, hEntries));
    this.hValue.set(h.value.subarray(0, hEntries));
    const capacity = this.outColumn.length;
    let written = 0;
    out.rowStart[0] = 0;
    for (let j = 0; j < cellCount;) {
      const next = this.compactKernel!(
        this.band.byteOffset, band - 1, j, cellCount, this.hStart.byteOffset, this.hColumn.byteOffset, this.hValue.byteOffset, hScale,
        this.outStart.byteOffset, this.outColumn.byteOffset, this.outValue.byteOffset, written, capacity,
      );
      if (next === j) throw new RangeError(`Gram band: row ${j} does not fit the output`);
      const chunk = this.outStart[next] - written;
      if (out.column.length < written + chunk) out.grow(2 * (written + chunk));
      out.rowStart.set(this.outStart.subarray(j + 1, next + 1), j + 1);
      out.column.set(this.outColumn.subarray(0, chunk), written);
      out.value.set(this.outValue.subarray(0, chunk), written);
      written += chunk;
      j = next;
    }
    return written;
  }

  /**
   * After `accumulate` (with room for `count` projections): out[a cellCount + k] = sum over the
   * rows e of B, in order, of weighted[a rows + e] B_ek, i.e. (B^T W v_a)_k for weighted = W v_a
   * (projectRows). Returns a view of the kernel's memory, valid until the next call.
   */
  project(weighted: Float64Array, count: number, cellCount: number): Float64Array {
    if (!this.inWasm) {
      this.plainProjected = ensureFloat64Capacity(this.plainProjected, count * cellCount);
      projectRows(this.plainRows!, weighted, count, this.plainProjected, cellCount);
      return this.plainProjected;
    }
    const rows = this.rows;
    if (count * rows > this.weighted.length || count * cellCount > this.projected.length) throw new RangeError('Gram band: accumulate was not given room for the projections');
    this.weighted.set(weighted.subarray(0, count * rows));
    this.projected.fill(0, 0, count * cellCount);
    this.projectKernel!(this.rowStart.byteOffset, this.column.byteOffset, this.value.byteOffset, rows, this.weighted.byteOffset, count, this.projected.byteOffset, cellCount);
    return this.projected;
  }

  /** A fresh (zeroed) memory with a quarter more room than asked, and its views. */
  private reserve(cells: number, band: number, rows: number, entries: number, hEntries: number, projections: number): void {
    const chunk = Math.max(COMPACT_CHUNK, withHeadroom(band));
    const sizes = [
      8 * withHeadroom(cells * band), 4 * (rows + 1), 4 * withHeadroom(entries), 8 * withHeadroom(entries), 8 * rows,
      4 * (cells + 1), 4 * withHeadroom(hEntries), 8 * withHeadroom(hEntries), 4 * (cells + 1), 4 * chunk, 8 * chunk,
      8 * projections * rows, 8 * withHeadroom(projections * cells),
    ];
    const { memory, starts } = memoryWithRegions(sizes);
    const exports = new WebAssembly.Instance(compiled!, { env: { memory } }).exports;
    this.accumulateKernel = exports.accumulate as Accumulate;
    this.compactKernel = exports.compact as Compact;
    this.projectKernel = exports.project as Project;
    const buffer = memory.buffer;
    const int32 = (k: number): Int32Array<ArrayBuffer> => new Int32Array(buffer, starts[k], sizes[k] / 4);
    const float64 = (k: number): Float64Array<ArrayBuffer> => new Float64Array(buffer, starts[k], sizes[k] / 8);
    this.band = float64(0);
    this.rowStart = new Int32Array(buffer, starts[1], rows + 1);
    this.column = int32(2);
    this.value = float64(3);
    this.weight = new Float64Array(buffer, starts[4], rows);
    this.hStart = int32(5);
    this.hColumn = int32(6);
    this.hValue = float64(7);
    this.outStart = int32(8);
    this.outColumn = int32(9);
    this.outValue = float64(10);
    this.weighted = float64(11);
    this.projected = float64(12);
  }

  private accumulatePlain(b: SortedSparseRows, w: Float64Array, cellCount: number, band: number): Float64Array {
    this.plainRows = b;
    if (this.plainBand.length < cellCount * band) this.plainBand = new Float64Array(cellCount * band);
    accumulateGramBand(b, w, band, this.plainBand);
    return this.plainBand;
  }
}

/**
 * WeightedGramBand's compaction in JavaScript (the kernel's twin): per row j, hScale H_jk added
 * into the band, then the nonzeros of the band's row j (columns max(0, j - band + 1) .. j, in
 * order) appended to `out` and cleared. Returns the entries written.
 */
export function compactBandRows(dense: Float64Array, band: number, h: SymmetricCsr, hScale: number, cellCount: number, out: GrowableLowerRows): number {
  let end = 0;
  out.rowStart[0] = 0;
  for (let j = 0; j < cellCount; j++) {
    const first = Math.max(0, j - band + 1);
    if (out.column.length < end + j - first + 1) out.grow(2 * (end + j - first + 1));
    const column = out.column, value = out.value;
    const base = bandOffset(j, 0, band);
    for (let k = h.rowStart[j]; k < h.rowStart[j + 1]; k++) dense[base + h.column[k]] += hScale * h.value[k];
    for (let c = first; c <= j; c++) {
      const v = dense[base + c];
      if (v !== 0) {
        column[end] = c;
        value[end++] = v;
        dense[base + c] = 0;
      }
    }
    out.rowStart[j + 1] = end;
  }
  return end;
}

/** WeightedGramBand's sums in JavaScript, the same operations in the same order, into `dense` (where WebAssembly is not available). */
export function accumulateGramBand(b: SortedSparseRows, w: Float64Array, band: number, dense: Float64Array): void {
  const { rowStart, column, value } = b;
  for (let e = 0; e < b.rowCount; e++) {
    const from = rowStart[e], to = rowStart[e + 1];
    const we = w[e];
    for (let x = from; x < to; x++) {
      const scaled = we * value[x];
      const rowX = bandOffset(column[x], 0, band);
      for (let y = from; y <= x; y++) dense[rowX + column[y]] += scaled * value[y];
    }
  }
}

/**
 * WeightedGramBand.project in JavaScript (the kernel's twin): out[a cellCount + k] = sum over the
 * rows e of b, in order, of weighted[a rows + e] b_ek, for a = 0 .. count - 1.
 */
export function projectRows(b: SortedSparseRows, weighted: Float64Array, count: number, out: Float64Array, cellCount: number): void {
  const { rowStart, column, value } = b;
  const rows = b.rowCount;
  out.fill(0, 0, count * cellCount);
  for (let e = 0; e < rows; e++) {
    for (let k = rowStart[e]; k < rowStart[e + 1]; k++) {
      const c = column[k], v = value[k];
      for (let a = 0; a < count; a++) out[a * cellCount + c] += weighted[a * rows + e] * v;
    }
  }
}
