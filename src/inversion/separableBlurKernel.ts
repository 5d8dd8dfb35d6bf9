import { WASM_TYPE, compileWasmModule, element, emitter, op } from '../numeric/wasm/wasmModuleBytes.js';

/**
 * SeparableBlur's per-cell passes (spread along x, spread along y, harvest onto the used pixels)
 * as one WebAssembly function (scalar): the same operations in the same order, so the rows of
 * B^T are the JavaScript loop's to the bit. V8 leaves the JavaScript loop with a bounds check
 * and a reload of every array at each step; this runs without either. It processes cells
 * cellFrom .. cellTo - 1 while the output has room for the next cell's most entries (its
 * entries of M^T times the kernel's area), writes each row's end into outStart, and returns the
 * first cell it did not process (cellTo when done). Parameters (i32): byte addresses of M^T's
 * row starts, pixels and values, xStart, usedAt, alongX, kx, alongY, ky, the padded width, the
 * offset `back` of the y pass, the across and down images, their stamps and lists, the output's
 * row starts, columns and values; then cellFrom, cellTo, the generation before cellFrom, and
 * the output's capacity in entries.
 */
function blurBody(): number[] {
  const [mtStart, mtPixel, mtValue, xStart, usedAt, alongX, kx, alongY, ky, width, back, across, down,
    acrossStamp, downStamp, acrossList, downList, outStart, outColumn, outValue, cellFrom, cellTo, generation, capacity] =
    Array.from({ length: 24 }, (_, i) => i);
  const [c, end, k, last, touched, reached, a, t, start, n, p, b, e] = Array.from({ length: 13 }, (_, i) => 24 + i);
  const [v, u] = [37, 38];
  const body: number[] = [];
  const emit = emitter(body);
  const get = op.localGet, set = op.localSet;
  const { at, i32At, f64At } = element;
  const increment = (local: number, by: number[]): number[] => [...get(local), ...by, ...op.i32Add, ...set(local)];
  // while (local < bound) { ...inner; local++ } with the loop's exit at depth 1.
  const countedLoop = (local: number, bound: number[], inner: () => void): void => {
    emit(op.block, op.loop, get(local), bound, op.i32GeS, op.brIf(1));
    inner();
    emit(increment(local, op.i32Const(1)), op.br(0), op.end, op.end);
  };
  emit(get(cellFrom), set(c), i32At(outStart, get(c)), set(end));
  emit(op.block, op.loop);
  emit(get(c), get(cellTo), op.i32GeS, op.brIf(1));
  emit(i32At(mtStart, get(c)), set(k), i32At(mtStart, [...get(c), ...op.i32Const(1), ...op.i32Add]), set(last));
  // Room for this cell's most entries, else stop here.
  emit(get(end), get(last), get(k), op.i32Sub, get(kx), op.i32Mul, get(ky), op.i32Mul, op.i32Add, get(capacity), op.i32GtS, op.brIf(1));
  emit(increment(generation, op.i32Const(1)));
  // Along x: each entry of the cell's row of M^T onto kx intermediate pixels.
  emit(op.i32Const(0), set(touched));
  countedLoop(k, get(last), () => {
    emit(f64At(mtValue, get(k)), set(v), i32At(xStart, i32At(mtPixel, get(k))), set(start), op.i32Const(0), set(a));
    countedLoop(a, get(kx), () => {
      emit(get(start), get(a), op.i32Add, set(t));
      emit(at(acrossList, get(touched), 2), get(t), op.i32Store(0));
      emit(i32At(acrossStamp, get(t)), get(generation), op.i32Ne, get(touched), op.i32Add, set(touched));
      emit(at(acrossStamp, get(t), 2), get(generation), op.i32Store(0));
      emit(at(across, get(t), 3), f64At(across, get(t)), f64At(alongX, get(a)), get(v), op.f64Mul, op.f64Add, op.f64Store(0));
    });
  });
  // Along y: each touched intermediate pixel onto ky output pixels, and cleared.
  emit(op.i32Const(0), set(reached), op.i32Const(0), set(n));
  countedLoop(n, get(touched), () => {
    emit(i32At(acrossList, get(n)), set(t), f64At(across, get(t)), set(u), at(across, get(t), 3), op.f64Const(0), op.f64Store(0));
    emit(get(t), get(back), op.i32Sub, set(p), op.i32Const(0), set(b));
    countedLoop(b, get(ky), () => {
      emit(at(downList, get(reached), 2), get(p), op.i32Store(0));
      emit(i32At(downStamp, get(p)), get(generation), op.i32Ne, get(reached), op.i32Add, set(reached));
      emit(at(downStamp, get(p), 2), get(generation), op.i32Store(0));
      emit(at(down, get(p), 3), f64At(down, get(p)), f64At(alongY, get(b)), get(u), op.f64Mul, op.f64Add, op.f64Store(0));
      emit(increment(p, get(width)));
    });
  });
  // Harvest: the reached pixels that are used become the row's entries; all are cleared.
  emit(op.i32Const(0), set(n));
  countedLoop(n, get(reached), () => {
    emit(i32At(downList, get(n)), set(p), i32At(usedAt, get(p)), set(e), f64At(down, get(p)), set(v), at(down, get(p), 3), op.f64Const(0), op.f64Store(0));
    emit(op.block, get(e), op.i32Const(0), op.i32LtS, op.brIf(0));
    emit(at(outColumn, get(end), 2), get(e), op.i32Store(0), at(outValue, get(end), 3), get(v), op.f64Store(0), increment(end, op.i32Const(1)));
    emit(op.end);
  });
  emit(increment(c, op.i32Const(1)), at(outStart, get(c), 2), get(end), op.i32Store(0));
  emit(op.br(0), op.end, op.end);
  emit(get(c));
  return body;
}

/**
 * SparseRows.transposeOf as a WebAssembly function, the same counting sort step for step (so
 * the same rows): parameters (i32) the byte addresses of the source's row starts, columns and
 * values, its rows and columns, and of the transpose's row starts (columns + 1), columns and
 * values.
 */
function transposeBody(): number[] {
  const [rowStart, column, value, rows, columns, outStart, outColumn, outValue] = Array.from({ length: 8 }, (_, i) => i);
  const [r, k, at, end, q] = [8, 9, 10, 11, 12];
  const body: number[] = [];
  const emit = emitter(body);
  const get = op.localGet, set = op.localSet;
  const { at: address, i32At } = element;
  const plusOne = (local: number): number[] => [...get(local), ...op.i32Const(1), ...op.i32Add];
  const countedLoop = (local: number, from: number[], bound: number[], inner: () => void): void => {
    emit(from, set(local), op.block, op.loop, get(local), bound, op.i32GeS, op.brIf(1));
    inner();
    emit(plusOne(local), set(local), op.br(0), op.end, op.end);
  };
  // Counts per column at outStart[column + 1], then their running sums.
  countedLoop(q, op.i32Const(0), plusOne(columns), () => emit(address(outStart, get(q), 2), op.i32Const(0), op.i32Store(0)));
  emit(i32At(rowStart, get(rows)), set(end));
  countedLoop(k, op.i32Const(0), get(end), () => {
    emit(address(outStart, [...i32At(column, get(k)), ...op.i32Const(1), ...op.i32Add], 2), set(at));
    emit(get(at), get(at), op.i32Load(0), op.i32Const(1), op.i32Add, op.i32Store(0));
  });
  countedLoop(q, op.i32Const(0), get(columns), () => {
    emit(address(outStart, plusOne(q), 2), set(at));
    emit(get(at), get(at), op.i32Load(0), i32At(outStart, get(q)), op.i32Add, op.i32Store(0));
  });
  // Each entry (r, c) to the next free place of row c; outStart[c] advances to the row's end.
  countedLoop(r, op.i32Const(0), get(rows), () => {
    countedLoop(k, i32At(rowStart, get(r)), i32At(rowStart, plusOne(r)), () => {
      emit(address(outStart, i32At(column, get(k)), 2), set(q));
      emit(get(q), op.i32Load(0), set(at), get(q), get(at), op.i32Const(1), op.i32Add, op.i32Store(0));
      emit(address(outColumn, get(at), 2), get(r), op.i32Store(0));
      emit(address(outValue, get(at), 3), address(value, get(k), 3), op.f64Load(0), op.f64Store(0));
    });
  });
  // Back by one: outStart[c] = outStart[c - 1] from the last column down, outStart[0] = 0.
  emit(get(columns), set(q));
  emit(op.block, op.loop, get(q), op.i32Eqz, op.brIf(1));
  emit(address(outStart, get(q), 2), address(outStart, get(q), 2), op.i32Const(4), op.i32Sub, op.i32Load(0), op.i32Store(0));
  emit(get(q), op.i32Const(1), op.i32Sub, set(q), op.br(0), op.end, op.end);
  emit(get(outStart), op.i32Const(0), op.i32Store(0));
  return body;
}

const I32 = WASM_TYPE.i32;

/** The compiled module, or null where WebAssembly is not available (SeparableBlur's JavaScript loop runs instead). */
export const separableBlurModule = compileWasmModule({
  types: [[new Array<number>(24).fill(I32), [I32]], [new Array<number>(8).fill(I32), []]],
  functions: [
    { type: 0, locals: [[13, I32], [2, WASM_TYPE.f64]], body: blurBody() },
    { type: 1, locals: [[5, I32]], body: transposeBody() },
  ],
  exports: [['fillRows', 0], ['transpose', 1]],
});

export type SparseTranspose = (
  rowStart: number, column: number, value: number, rows: number, columns: number, outStart: number, outColumn: number, outValue: number,
) => void;

export type SeparableBlurFill = (
  mtStart: number, mtPixel: number, mtValue: number, xStart: number, usedAt: number, alongX: number, kx: number, alongY: number, ky: number,
  width: number, back: number, across: number, down: number, acrossStamp: number, downStamp: number, acrossList: number, downList: number,
  outStart: number, outColumn: number, outValue: number, cellFrom: number, cellTo: number, generation: number, capacity: number,
) => number;
