import { WASM_TYPE, compileWasmModule, element, emitter, integer, op } from '../numeric/wasm/wasmModuleBytes.js';
import { memoryWithRegions } from '../numeric/wasm/wasmMemory.js';

/**
 * BlurredMapping's rows of B^T for a kernel that is not separable, as one WebAssembly function
 * (scalar): for each cell, each entry (pixel q, value v) of its row of M^T is spread to the used
 * pixels that read q, with their taps (the spread lists), through a work row stamped per cell;
 * then the row's entries are harvested in order of first touch and the work row cleared. The
 * same operations in the same order as BlurredMapping's JavaScript loop, so the same rows to the
 * bit. It processes cells cellFrom .. cellTo - 1 while the output has room for the next cell's
 * most entries (rowBound), writes each row's end into outStart, and returns the first cell it
 * did not process (cellTo when done). Parameters (i32): byte addresses of M^T's row starts,
 * pixels and values, of the spread lists' starts, pixels and taps, of the stamps and the work
 * row, of the output's row starts, columns and values; then cellFrom, cellTo, the generation
 * before cellFrom, the output's capacity in entries and the longest spread list.
 */
function spreadBody(): number[] {
  const [mtStart, mtPixel, mtValue, spreadStart, spreadPixel, spreadTap, stamp, work, outStart, outColumn, outValue,
    cellFrom, cellTo, generation, capacity, longestSpread] = Array.from({ length: 16 }, (_, i) => i);
  const [c, end, k, last, q, s, sEnd, e, first] = Array.from({ length: 9 }, (_, i) => 16 + i);
  const v = 25;
  const body: number[] = [];
  const emit = emitter(body);
  const get = op.localGet, set = op.localSet;
  const { at, i32At, f64At } = element;
  const { increment } = integer;
  const countedLoop = (local: number, bound: number[], inner: () => void): void => {
    emit(op.block, op.loop, get(local), bound, op.i32GeS, op.brIf(1));
    inner();
    emit(increment(local), op.br(0), op.end, op.end);
  };
  emit(get(cellFrom), set(c), i32At(outStart, get(c)), set(end));
  emit(op.block, op.loop);
  emit(get(c), get(cellTo), op.i32GeS, op.brIf(1));
  emit(i32At(mtStart, get(c)), set(k), i32At(mtStart, [...get(c), ...op.i32Const(1), ...op.i32Add]), set(last));
  // Room for this cell's most entries (its entries of M^T times the longest spread), else stop.
  emit(get(end), get(last), get(k), op.i32Sub, get(longestSpread), op.i32Mul, op.i32Add, get(capacity), op.i32GtS, op.brIf(1));
  emit(increment(generation), get(end), set(first));
  countedLoop(k, get(last), () => {
    emit(i32At(mtPixel, get(k)), set(q), f64At(mtValue, get(k)), set(v));
    emit(i32At(spreadStart, get(q)), set(s), i32At(spreadStart, [...get(q), ...op.i32Const(1), ...op.i32Add]), set(sEnd));
    countedLoop(s, get(sEnd), () => {
      emit(i32At(spreadPixel, get(s)), set(e));
      emit(at(outColumn, get(end), 2), get(e), op.i32Store(0));
      emit(i32At(stamp, get(e)), get(generation), op.i32Ne, get(end), op.i32Add, set(end));
      emit(at(stamp, get(e), 2), get(generation), op.i32Store(0));
      emit(at(work, get(e), 3), f64At(work, get(e)), f64At(spreadTap, get(s)), get(v), op.f64Mul, op.f64Add, op.f64Store(0));
    });
  });
  // Harvest in order of first touch; the work row is left all zero.
  emit(get(first), set(k));
  countedLoop(k, get(end), () => {
    emit(i32At(outColumn, get(k)), set(e));
    emit(at(outValue, get(k), 3), f64At(work, get(e)), op.f64Store(0));
    emit(at(work, get(e), 3), op.f64Const(0), op.f64Store(0));
  });
  emit(increment(c), at(outStart, get(c), 2), get(end), op.i32Store(0));
  emit(op.br(0), op.end, op.end);
  emit(get(c));
  return body;
}

export type SpreadFill = (
  mtStart: number, mtPixel: number, mtValue: number, spreadStart: number, spreadPixel: number, spreadTap: number,
  stamp: number, work: number, outStart: number, outColumn: number, outValue: number,
  cellFrom: number, cellTo: number, generation: number, capacity: number, longestSpread: number,
) => number;

const i32 = WASM_TYPE.i32;

/** The compiled module, or null where the engine has no WebAssembly (BlurredMapping then runs its JavaScript loop). */
export const spreadBlurModule = compileWasmModule({
  types: [[Array.from({ length: 16 }, () => i32), [i32]]],
  functions: [{ type: 0, locals: [[9, i32], [1, WASM_TYPE.f64]], body: spreadBody() }],
  exports: [['spreadRows', 0]],
});

/** The spread lists (fixed by the grid and kernel) that every memory holds. */
export interface SpreadLists {
  readonly start: Int32Array;
  readonly pixel: Int32Array;
  readonly tap: Float64Array;
}

/**
 * A memory for spreadRows with room for `cells` cells, `entries` entries of M^T and `out` entries
 * of B^T, the spread lists copied in; stamps and work row zero.
 */
export class SpreadMemory {
  readonly cells: number;
  readonly entries: number;
  readonly out: number;
  readonly mtStart: Int32Array;
  readonly mtPixel: Int32Array;
  readonly mtValue: Float64Array;
  readonly outStart: Int32Array;
  readonly outColumn: Int32Array;
  readonly outValue: Float64Array;
  readonly stamp: Int32Array;
  generation = 0;
  private readonly fillRows: SpreadFill;
  private readonly addresses: readonly number[];
  private readonly longestSpread: number;

  /** `longestSpread`: the most used pixels in one spread list (bounds a cell's output). */
  constructor(lists: SpreadLists, usedCount: number, longestSpread: number, room: { cells: number; entries: number; out: number }) {
    this.cells = room.cells;
    this.entries = room.entries;
    this.out = room.out;
    const lengths = [
      4 * (room.cells + 1), 4 * room.entries, 8 * room.entries,
      4 * lists.start.length, 4 * lists.pixel.length, 8 * lists.tap.length,
      4 * usedCount, 8 * usedCount,
      4 * (room.cells + 1), 4 * room.out, 8 * room.out,
    ];
    const { memory, starts } = memoryWithRegions(lengths);
    const buffer = memory.buffer;
    this.addresses = starts;
    this.mtStart = new Int32Array(buffer, starts[0], room.cells + 1);
    this.mtPixel = new Int32Array(buffer, starts[1], room.entries);
    this.mtValue = new Float64Array(buffer, starts[2], room.entries);
    new Int32Array(buffer, starts[3], lists.start.length).set(lists.start);
    new Int32Array(buffer, starts[4], lists.pixel.length).set(lists.pixel);
    new Float64Array(buffer, starts[5], lists.tap.length).set(lists.tap);
    this.stamp = new Int32Array(buffer, starts[6], usedCount);
    this.outStart = new Int32Array(buffer, starts[8], room.cells + 1);
    this.outColumn = new Int32Array(buffer, starts[9], room.out);
    this.outValue = new Float64Array(buffer, starts[10], room.out);
    this.longestSpread = longestSpread;
    this.fillRows = new WebAssembly.Instance(spreadBlurModule!, { env: { memory } }).exports.spreadRows as SpreadFill;
  }

  /** Runs the kernel over cells 0 .. cellCount - 1 of the M^T held; returns the first cell it could not hold. */
  fill(cellCount: number): number {
    const s = this.addresses;
    this.outStart[0] = 0;
    const done = this.fillRows(s[0], s[1], s[2], s[3], s[4], s[5], s[6], s[7], s[8], s[9], s[10], 0, cellCount, this.generation, this.out, this.longestSpread);
    this.generation += done;
    return done;
  }
}
