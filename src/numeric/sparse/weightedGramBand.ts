import { WASM_TYPE, compileWasmModule, emitter, op } from '../wasm/wasmModuleBytes.js';
import { memoryWithRegions } from '../wasm/wasmMemory.js';

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

const I32 = WASM_TYPE.i32;

/** The compiled module, or null where WebAssembly is not available (the plain loop runs instead). */
const compiled = compileWasmModule({
  types: [[[I32, I32, I32, I32, I32, I32, I32], []]],
  functions: [{ type: 0, locals: [[6, I32], [1, WASM_TYPE.f64], [3, I32], [2, WASM_TYPE.f64], [1, I32]], body: accumulateBody() }],
  exports: [['accumulate', 0]],
});

type Accumulate = (rowStart: number, column: number, value: number, w: number, dense: number, rows: number, bandLess: number) => void;

/**
 * A dense band for G = B^T W B and the kernel that fills it. `accumulate` copies B and w into
 * the kernel's memory (the engine's block copies of subarray views), adds G's lower
 * triangle into the band, and returns the band (bandOffset layout; the array may be longer than
 * cellCount * band), which the caller reads and must leave all zero again (it is zero the first
 * time and after growth). The memory and its views are made when a call needs more room than
 * they have and reused otherwise, so a call allocates nothing.
 */
export class WeightedGramBand {
  private kernel: Accumulate | null = null;
  /** Views of the kernel's memory: the band from byte 0, then B's row starts, columns and values, and w. */
  private band = new Float64Array(0);
  private rowStart = new Int32Array(0);
  private column = new Int32Array(0);
  private value = new Float64Array(0);
  private weight = new Float64Array(0);

  accumulate(b: SortedSparseRows, w: Float64Array, cellCount: number, band: number): Float64Array {
    if (compiled === null) return this.accumulatePlain(b, w, cellCount, band);
    const rows = b.rowCount;
    const entries = b.rowStart[rows];
    if (cellCount * band > this.band.length || rows + 1 > this.rowStart.length || entries > this.column.length) {
      this.reserve(cellCount * band, rows, entries);
    }
    this.rowStart.set(b.rowStart.subarray(0, rows + 1));
    this.column.set(b.column.subarray(0, entries));
    this.value.set(b.value.subarray(0, entries));
    this.weight.set(w.subarray(0, rows));
    this.kernel!(this.rowStart.byteOffset, this.column.byteOffset, this.value.byteOffset, this.weight.byteOffset, this.band.byteOffset, rows, band - 1);
    return this.band;
  }

  /** A fresh (zeroed) memory with a quarter more room than asked, and its views. */
  private reserve(bandEntries: number, rows: number, entries: number): void {
    const sizes = [8 * Math.ceil(1.25 * bandEntries), 4 * (rows + 1), 4 * Math.ceil(1.25 * entries), 8 * Math.ceil(1.25 * entries), 8 * rows];
    const { memory, starts } = memoryWithRegions(sizes);
    this.kernel = new WebAssembly.Instance(compiled!, { env: { memory } }).exports.accumulate as Accumulate;
    const buffer = memory.buffer;
    this.band = new Float64Array(buffer, starts[0], sizes[0] / 8);
    this.rowStart = new Int32Array(buffer, starts[1], rows + 1);
    this.column = new Int32Array(buffer, starts[2], sizes[2] / 4);
    this.value = new Float64Array(buffer, starts[3], sizes[3] / 8);
    this.weight = new Float64Array(buffer, starts[4], rows);
  }

  /** The same sums in JavaScript, where WebAssembly is not available. */
  private plainBand = new Float64Array(0);

  private accumulatePlain(b: SortedSparseRows, w: Float64Array, cellCount: number, band: number): Float64Array {
    if (this.plainBand.length < cellCount * band) this.plainBand = new Float64Array(cellCount * band);
    accumulateGramBand(b, w, band, this.plainBand);
    return this.plainBand;
  }
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
