import { WASM_TYPE, compileWasmModule, emitter, op, type Emit } from '../wasm/wasmModuleBytes.js';
import { memoryWithRegions } from '../wasm/wasmMemory.js';

/** The dense kernels that run as WebAssembly SIMD on a Float64Array held in their own memory. */
export interface SimdTileKernels {
  /**
   * Rows iFrom .. iEnd - 1 (a multiple of 4 apart) of columns j .. j + 3 of the column-major
   * array at byte `base` (leading dimension ld) less the products of their panel rows:
   * a[i, j + c] -= sum_p a[i, p] a[j + c, p] over p = panel .. panel + width - 1.
   */
  rankUpdateColumns(base: number, ld: number, j: number, iFrom: number, iEnd: number, panel: number, width: number): void;
  /**
   * The triangular solve X L^T = B of panelTriangularSolve on rows iFrom .. iEnd - 1 (a
   * multiple of 4 apart) and the first blockedWidth (a multiple of 4) columns from `diagonal`.
   */
  panelSolveRows(base: number, ld: number, diagonal: number, blockedWidth: number, iFrom: number, iEnd: number): void;
  /**
   * Row i of columns jFrom .. jEnd - 1 (a multiple of 4 apart) less the products of their panel
   * rows: a[i, j] -= sum_p a[i, p] a[j, p] over p = panel .. panel + width - 1 (the rows left
   * below the last full tile of a rank update).
   */
  rankUpdateRow(base: number, ld: number, i: number, jFrom: number, jEnd: number, panel: number, width: number): void;
  /** The diagonal tile of columns j .. j + 3 less its panel products, on and below the diagonal only. */
  rankUpdateDiagonal(base: number, ld: number, j: number, panel: number, width: number): void;
}

/** Local variable numbers of a kernel: its i32 scratch after the parameters, then the v128 ones. */
interface TileLocals {
  readonly base: number;
  readonly ld: number;
  /** Loop counter and byte addresses: the 4 rows, the 4 columns, the output, the column stride. */
  readonly pa: number;
  readonly pb: number;
  readonly q: number;
  readonly stride: number;
  /** Eight two-lane sums (column c, rows i, i + 1 in sum(2c); rows i + 2, i + 3 in sum(2c + 1)), then a01, a23, b. */
  readonly firstVector: number;
}

/** Byte address of element (row, column) of the array: base + ((column * ld + row) << 3). */
function address(t: TileLocals, column: number[], row: number[]): number[] {
  return [...op.localGet(t.base), ...column, ...op.localGet(t.ld), ...op.i32Mul, ...row, ...op.i32Add, ...op.i32Const(3), ...op.i32Shl, ...op.i32Add];
}

/**
 * The 4 x 4 block of sums of productTile in eight two-lane registers, each panel value loaded
 * once per block (the register blocking of Goto & van de Geijn 2008, ACM Trans. Math. Software
 * 34, 12): rows `row` .. + 3 against rows `other` .. + 3 over `count` columns from `panel`.
 * Each lane adds its products in productTile's order, so the sums are the same to the bit.
 */
function emitTileSums(emit: Emit, t: TileLocals, row: number[], other: number[], panel: number[], count: number[]): void {
  const sum = (k: number): number => t.firstVector + k;
  const [a01, a23, b] = [t.firstVector + 8, t.firstVector + 9, t.firstVector + 10];
  for (let k = 0; k < 8; k++) emit(op.v128Zero, op.localSet(sum(k)));
  emit(address(t, panel, row), op.localSet(t.pa), address(t, panel, other), op.localSet(t.pb), count, op.localSet(t.q));
  emit(op.block, op.loop, op.localGet(t.q), op.i32Eqz, op.brIf(1));
  emit(op.localGet(t.pa), op.v128Load(0), op.localSet(a01), op.localGet(t.pa), op.v128Load(16), op.localSet(a23));
  for (let c = 0; c < 4; c++) {
    emit(op.localGet(t.pb), op.v128Load64Splat(8 * c), op.localSet(b));
    emit(op.localGet(sum(2 * c)), op.localGet(a01), op.localGet(b), op.f64x2Mul, op.f64x2Add, op.localSet(sum(2 * c)));
    emit(op.localGet(sum(2 * c + 1)), op.localGet(a23), op.localGet(b), op.f64x2Mul, op.f64x2Add, op.localSet(sum(2 * c + 1)));
  }
  emit(op.localGet(t.pa), op.localGet(t.stride), op.i32Add, op.localSet(t.pa));
  emit(op.localGet(t.pb), op.localGet(t.stride), op.i32Add, op.localSet(t.pb));
  emit(op.localGet(t.q), op.i32Const(1), op.i32Sub, op.localSet(t.q), op.br(0), op.end, op.end);
}

/**
 * rankUpdateColumns (symmetricRankUpdate's tiles below the diagonal). Parameters (i32): base,
 * ld, j, iFrom, iEnd, panel, width; then i32 i, pa, pb, stride, q, pc; then 11 v128.
 */
function rankUpdateBody(): number[] {
  const [j, iFrom, iEnd, panel, width, i, pc] = [2, 3, 4, 5, 6, 7, 12];
  const t: TileLocals = { base: 0, ld: 1, pa: 8, pb: 9, stride: 10, q: 11, firstVector: 13 };
  const body: number[] = [];
  const emit = emitter(body);
  emit(op.localGet(t.ld), op.i32Const(3), op.i32Shl, op.localSet(t.stride), op.localGet(iFrom), op.localSet(i));
  emit(op.block, op.loop, op.localGet(i), op.localGet(iEnd), op.i32GeS, op.brIf(1));
  emitTileSums(emit, t, op.localGet(i), op.localGet(j), op.localGet(panel), op.localGet(width));
  emit(address(t, op.localGet(j), op.localGet(i)), op.localSet(pc));
  for (let c = 0; c < 4; c++) {
    for (let half = 0; half < 2; half++) {
      emit(op.localGet(pc), op.localGet(pc), op.v128Load(16 * half), op.localGet(t.firstVector + 2 * c + half), op.f64x2Sub, op.v128Store(16 * half));
    }
    emit(op.localGet(pc), op.localGet(t.stride), op.i32Add, op.localSet(pc));
  }
  emit(op.localGet(i), op.i32Const(4), op.i32Add, op.localSet(i), op.br(0), op.end, op.end);
  return body;
}

/**
 * solveRowBlocks (panelTriangularSolve's blocks of 4 rows x 4 columns), as solveTile computes
 * each: x_c = (b_c - sums_c - sum_{d < c} x_d L_cd) / L_cc, the operations in the same order.
 * Parameters (i32): base, ld, diagonal, blockedWidth, iFrom, iEnd; then i32 i, j, pa, pb,
 * stride, q, pc; then 11 v128 and 4 more for x_0 .. x_3 of one pair of rows.
 */
function panelSolveBody(): number[] {
  const [diagonal, blockedWidth, iFrom, iEnd, i, j, pc] = [2, 3, 4, 5, 6, 7, 12];
  const t: TileLocals = { base: 0, ld: 1, pa: 8, pb: 9, stride: 10, q: 11, firstVector: 13 };
  const x = (c: number): number => t.firstVector + 11 + c;
  const body: number[] = [];
  const emit = emitter(body);
  const jPlus = (k: number): number[] => [...op.localGet(j), ...op.i32Const(k), ...op.i32Add];
  const lower = (row: number, column: number): number[] => [...address(t, jPlus(column), jPlus(row)), ...op.v128Load64Splat(0)];
  emit(op.localGet(t.ld), op.i32Const(3), op.i32Shl, op.localSet(t.stride), op.localGet(iFrom), op.localSet(i));
  emit(op.block, op.loop, op.localGet(i), op.localGet(iEnd), op.i32GeS, op.brIf(1));
  emit(op.localGet(diagonal), op.localSet(j));
  emit(op.block, op.loop, op.localGet(j), op.localGet(diagonal), op.localGet(blockedWidth), op.i32Add, op.i32GeS, op.brIf(1));
  emitTileSums(emit, t, op.localGet(i), op.localGet(j), op.localGet(diagonal), [...op.localGet(j), ...op.localGet(diagonal), ...op.i32Sub]);
  for (let half = 0; half < 2; half++) {
    emit(address(t, op.localGet(j), op.localGet(i)), op.localSet(pc));
    for (let c = 0; c < 4; c++) {
      emit(op.localGet(pc));
      emit(op.localGet(pc), op.v128Load(16 * half), op.localGet(t.firstVector + 2 * c + half), op.f64x2Sub);
      for (let d = 0; d < c; d++) emit(op.localGet(x(d)), lower(c, d), op.f64x2Mul, op.f64x2Sub);
      emit(lower(c, c), op.f64x2Div, op.localSet(x(c)));
      emit(op.localGet(x(c)), op.v128Store(16 * half));
      emit(op.localGet(pc), op.localGet(t.stride), op.i32Add, op.localSet(pc));
    }
  }
  emit(op.localGet(j), op.i32Const(4), op.i32Add, op.localSet(j), op.br(0), op.end, op.end);
  emit(op.localGet(i), op.i32Const(4), op.i32Add, op.localSet(i), op.br(0), op.end, op.end);
  return body;
}

/**
 * rankUpdateRow: per block of four columns j .. j + 3, two two-lane sums (columns j, j + 1 and
 * j + 2, j + 3), each lane adding a[i, p] a[j + c, p] over p in columnProduct's order, so each
 * entry is the same to the bit; then the four entries of row i less their lanes. Parameters
 * (i32): base, ld, i, jFrom, jEnd, panel, width; then i32 j, pa, pb, stride, q, pc; then v128
 * s01, s23, x.
 */
function rankUpdateRowBody(): number[] {
  const [i, jFrom, jEnd, panel, width, j, pc] = [2, 3, 4, 5, 6, 7, 12];
  const t: TileLocals = { base: 0, ld: 1, pa: 8, pb: 9, stride: 10, q: 11, firstVector: 13 };
  const [s01, s23, x] = [t.firstVector, t.firstVector + 1, t.firstVector + 2];
  const body: number[] = [];
  const emit = emitter(body);
  emit(op.localGet(t.ld), op.i32Const(3), op.i32Shl, op.localSet(t.stride), op.localGet(jFrom), op.localSet(j));
  emit(op.block, op.loop, op.localGet(j), op.localGet(jEnd), op.i32GeS, op.brIf(1));
  emit(op.v128Zero, op.localSet(s01), op.v128Zero, op.localSet(s23));
  emit(address(t, op.localGet(panel), op.localGet(i)), op.localSet(t.pa), address(t, op.localGet(panel), op.localGet(j)), op.localSet(t.pb));
  emit(op.localGet(width), op.localSet(t.q));
  emit(op.block, op.loop, op.localGet(t.q), op.i32Eqz, op.brIf(1));
  emit(op.localGet(t.pa), op.v128Load64Splat(0), op.localSet(x));
  emit(op.localGet(s01), op.localGet(x), op.localGet(t.pb), op.v128Load(0), op.f64x2Mul, op.f64x2Add, op.localSet(s01));
  emit(op.localGet(s23), op.localGet(x), op.localGet(t.pb), op.v128Load(16), op.f64x2Mul, op.f64x2Add, op.localSet(s23));
  emit(op.localGet(t.pa), op.localGet(t.stride), op.i32Add, op.localSet(t.pa));
  emit(op.localGet(t.pb), op.localGet(t.stride), op.i32Add, op.localSet(t.pb));
  emit(op.localGet(t.q), op.i32Const(1), op.i32Sub, op.localSet(t.q), op.br(0), op.end, op.end);
  emit(address(t, op.localGet(j), op.localGet(i)), op.localSet(pc));
  for (let c = 0; c < 4; c++) {
    emit(op.localGet(pc), op.localGet(pc), op.f64Load(0), op.localGet(c < 2 ? s01 : s23), op.f64x2ExtractLane(c & 1), op.f64Sub, op.f64Store(0));
    emit(op.localGet(pc), op.localGet(t.stride), op.i32Add, op.localSet(pc));
  }
  emit(op.localGet(j), op.i32Const(4), op.i32Add, op.localSet(j), op.br(0), op.end, op.end);
  return body;
}

/**
 * rankUpdateDiagonal: the tile sums of rows j .. j + 3 against themselves (emitTileSums, so each
 * entry is productTile's to the bit), subtracted from the ten entries on and below the
 * diagonal: whole pairs where both rows are, a single lane for the pair the diagonal cuts.
 * Parameters (i32): base, ld, j, panel, width; then i32 pa, pb, stride, q, pc; then 11 v128.
 */
function rankUpdateDiagonalBody(): number[] {
  const [j, panel, width, pc] = [2, 3, 4, 9];
  const t: TileLocals = { base: 0, ld: 1, pa: 5, pb: 6, stride: 7, q: 8, firstVector: 10 };
  const body: number[] = [];
  const emit = emitter(body);
  emit(op.localGet(t.ld), op.i32Const(3), op.i32Shl, op.localSet(t.stride));
  emitTileSums(emit, t, op.localGet(j), op.localGet(j), op.localGet(panel), op.localGet(width));
  emit(address(t, op.localGet(j), op.localGet(j)), op.localSet(pc));
  const pair = (c: number, half: number): number[][] => [
    op.localGet(pc), op.localGet(pc), op.v128Load(16 * half), op.localGet(t.firstVector + 2 * c + half), op.f64x2Sub, op.v128Store(16 * half),
  ];
  const lane = (c: number, row: number): number[][] => [
    op.localGet(pc), op.localGet(pc), op.f64Load(8 * row), op.localGet(t.firstVector + 2 * c + (row >> 1)), op.f64x2ExtractLane(row & 1), op.f64Sub, op.f64Store(8 * row),
  ];
  for (let c = 0; c < 4; c++) {
    // Column c: rows c .. 3 of the tile.
    if (c === 0) emit(...pair(0, 0), ...pair(0, 1));
    if (c === 1) emit(...lane(1, 1), ...pair(1, 1));
    if (c === 2) emit(...pair(2, 1));
    if (c === 3) emit(...lane(3, 3));
    emit(op.localGet(pc), op.localGet(t.stride), op.i32Add, op.localSet(pc));
  }
  return body;
}

const I32 = WASM_TYPE.i32;

/** The compiled module, or null where WebAssembly SIMD is not available (the JavaScript kernels run instead). */
const compiled = compileWasmModule({
  types: [[[I32, I32, I32, I32, I32, I32, I32], []], [[I32, I32, I32, I32, I32, I32], []], [[I32, I32, I32, I32, I32], []]],
  functions: [
    { type: 0, locals: [[6, I32], [11, WASM_TYPE.v128]], body: rankUpdateBody() },
    { type: 1, locals: [[7, I32], [15, WASM_TYPE.v128]], body: panelSolveBody() },
    { type: 0, locals: [[6, I32], [3, WASM_TYPE.v128]], body: rankUpdateRowBody() },
    { type: 2, locals: [[5, I32], [11, WASM_TYPE.v128]], body: rankUpdateDiagonalBody() },
  ],
  exports: [['rankUpdateColumns', 0], ['panelSolveRows', 1], ['rankUpdateRow', 2], ['rankUpdateDiagonal', 3]],
});

/** The kernels bound to each memory's buffer. */
const kernelsByBuffer = new WeakMap<ArrayBufferLike, SimdTileKernels>();

/** The SIMD kernels that work on `a` in place, or undefined when `a` is an ordinary array. */
export function simdKernelsOf(a: Float64Array): SimdTileKernels | undefined {
  return kernelsByBuffer.get(a.buffer);
}

/**
 * Binds the SIMD kernels to `memory`, so that simdKernelsOf finds them for arrays on its buffer
 * (which must not grow after); false where WebAssembly SIMD is not available.
 */
export function bindSimdTileKernels(memory: WebAssembly.Memory): boolean {
  if (compiled === null) return false;
  const instance = new WebAssembly.Instance(compiled, { env: { memory } });
  kernelsByBuffer.set(memory.buffer, instance.exports as unknown as SimdTileKernels);
  return true;
}

/**
 * `a` when it holds at least `n` values, else a new zeroed array of at least n values in a
 * memory of its own with the SIMD kernels bound to it (an ordinary Float64Array where
 * WebAssembly SIMD is not available). Unlike ensureFloat64Capacity it does not copy the old
 * contents: the multifrontal fronts are refilled at every factorisation.
 */
export function ensureSimdFloat64Capacity(a: Float64Array<ArrayBuffer>, n: number): Float64Array<ArrayBuffer> {
  if (a.length >= n && (compiled === null || simdKernelsOf(a) !== undefined)) return a;
  const length = Math.max(n, Math.ceil(a.length * 1.5), 1);
  if (compiled === null) return new Float64Array(length);
  const { memory } = memoryWithRegions([8 * length]);
  bindSimdTileKernels(memory);
  return new Float64Array(memory.buffer, 0, length);
}
