import { WASM_TYPE, compileWasmModule, emitter, op, type WasmModuleSpec } from '../wasm/wasmModuleBytes.js';
import { memoryWithRegions } from '../wasm/wasmMemory.js';
import { weightedNormalEquations } from './weightedNormalEquations.js';

/** A tile is this many weighted rows (p) by this many plain rows (q): 8 two-lane sums and 5 operands in registers. */
const TILE_P = 4;
const TILE_Q = 2;

/**
 * weightRows: each weighted row = its plain row times w, point by point, over `rows` rows of n
 * points stored one after the other. Parameters (i32, byte addresses): plain, weighted, w,
 * rows; then i32 r, o.
 */
function weightRowsBody(n: number): number[] {
  const [plain, weighted, w, rows, r, o] = [0, 1, 2, 3, 4, 5];
  const pairBytes = 16 * Math.floor(n / 2);
  const body: number[] = [];
  const emit = emitter(body);
  emit(op.i32Const(0), op.localSet(r));
  emit(op.block, op.loop, op.localGet(r), op.localGet(rows), op.i32GeS, op.brIf(1));
  emit(op.i32Const(0), op.localSet(o));
  emit(op.block, op.loop, op.localGet(o), op.i32Const(pairBytes), op.i32GeS, op.brIf(1));
  emit(op.localGet(weighted), op.localGet(o), op.i32Add);
  emit(op.localGet(plain), op.localGet(o), op.i32Add, op.v128Load(0), op.localGet(w), op.localGet(o), op.i32Add, op.v128Load(0), op.f64x2Mul, op.v128Store(0));
  emit(op.localGet(o), op.i32Const(16), op.i32Add, op.localSet(o), op.br(0), op.end, op.end);
  if (n % 2 === 1) emit(op.localGet(weighted), op.localGet(plain), op.f64Load(pairBytes), op.localGet(w), op.f64Load(pairBytes), op.f64Mul, op.f64Store(pairBytes));
  emit(op.localGet(weighted), op.i32Const(8 * n), op.i32Add, op.localSet(weighted));
  emit(op.localGet(plain), op.i32Const(8 * n), op.i32Add, op.localSet(plain));
  emit(op.localGet(r), op.i32Const(1), op.i32Add, op.localSet(r), op.br(0), op.end, op.end);
  return body;
}

/**
 * gramTiles: for every tile of weighted rows p0 .. p0 + 3 (p0 < pRows) and plain rows q0, q0 + 1
 * (q0 < p0 + 4), the sums sum_i weighted_p[i] plain_q[i] in two lanes, lane 0 over the even i
 * and lane 1 over the odd i, each in order (for odd n the last point goes to lane 0 and lane 1
 * adds 0 * 0, which changes no sum that starts at +0), stored as the pair at
 * sums + p sumRowBytes + 16 q. Every operand of a step is
 * loaded once per tile (the register blocking of Goto & van de Geijn 2008, ACM Trans. Math.
 * Software 34, 12), at offsets that hold the row length n, so a module serves one n.
 * Parameters (i32): weighted, plain, pRows, sums, sumRowBytes; then i32 p0, q0, pw, pp, end,
 * at; then 8 v128 sums, 4 weighted values and 1 plain value.
 */
function gramTilesBody(n: number): number[] {
  const [weighted, plain, pRows, sums, sumRowBytes, p0, q0, pw, pp, end, at] = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
  const rowBytes = 8 * n;
  const pairBytes = 16 * Math.floor(n / 2);
  const sum = (r: number, c: number): number => 11 + r * TILE_Q + c;
  const weightedValue = (r: number): number => 11 + TILE_P * TILE_Q + r;
  const plainValue = 11 + TILE_P * TILE_Q + TILE_P;
  const body: number[] = [];
  const emit = emitter(body);
  const rowAddress = (base: number, row: number): number[] => [...op.localGet(base), ...op.localGet(row), ...op.i32Const(rowBytes), ...op.i32Mul, ...op.i32Add];
  const sumAddress = (r: number): number[] => [...op.localGet(at), ...op.localGet(sumRowBytes), ...op.i32Const(r), ...op.i32Mul, ...op.i32Add];
  const step = (load: (offset: number) => number[]): void => {
    for (let r = 0; r < TILE_P; r++) emit(op.localGet(pw), load(r * rowBytes), op.localSet(weightedValue(r)));
    for (let c = 0; c < TILE_Q; c++) {
      emit(op.localGet(pp), load(c * rowBytes), op.localSet(plainValue));
      for (let r = 0; r < TILE_P; r++) {
        emit(op.localGet(sum(r, c)), op.localGet(weightedValue(r)), op.localGet(plainValue), op.f64x2Mul, op.f64x2Add, op.localSet(sum(r, c)));
      }
    }
  };
  emit(op.i32Const(0), op.localSet(p0));
  emit(op.block, op.loop, op.localGet(p0), op.localGet(pRows), op.i32GeS, op.brIf(1));
  emit(op.i32Const(0), op.localSet(q0));
  emit(op.block, op.loop, op.localGet(q0), op.localGet(p0), op.i32Const(TILE_P), op.i32Add, op.i32GeS, op.brIf(1));
  for (let r = 0; r < TILE_P; r++) for (let c = 0; c < TILE_Q; c++) emit(op.v128Zero, op.localSet(sum(r, c)));
  emit(rowAddress(weighted, p0), op.localSet(pw), rowAddress(plain, q0), op.localSet(pp));
  emit(op.localGet(pw), op.i32Const(pairBytes), op.i32Add, op.localSet(end));
  emit(op.block, op.loop, op.localGet(pw), op.localGet(end), op.i32GeS, op.brIf(1));
  step(op.v128Load);
  emit(op.localGet(pw), op.i32Const(16), op.i32Add, op.localSet(pw), op.localGet(pp), op.i32Const(16), op.i32Add, op.localSet(pp));
  emit(op.br(0), op.end, op.end);
  if (n % 2 === 1) step(op.v128Load64Zero);
  emit(op.localGet(sums), op.localGet(p0), op.localGet(sumRowBytes), op.i32Mul, op.i32Add, op.localGet(q0), op.i32Const(4), op.i32Shl, op.i32Add, op.localSet(at));
  for (let r = 0; r < TILE_P; r++) for (let c = 0; c < TILE_Q; c++) emit(sumAddress(r), op.localGet(sum(r, c)), op.v128Store(16 * c));
  emit(op.localGet(q0), op.i32Const(TILE_Q), op.i32Add, op.localSet(q0), op.br(0), op.end, op.end);
  emit(op.localGet(p0), op.i32Const(TILE_P), op.i32Add, op.localSet(p0), op.br(0), op.end, op.end);
  return body;
}

const I32 = WASM_TYPE.i32;

function moduleSpec(n: number): WasmModuleSpec {
  return {
    types: [[[I32, I32, I32, I32], []], [[I32, I32, I32, I32, I32], []]],
    functions: [
      { type: 0, locals: [[2, I32]], body: weightRowsBody(n) },
      { type: 1, locals: [[6, I32], [TILE_P * TILE_Q + TILE_P + 1, WASM_TYPE.v128]], body: gramTilesBody(n) },
    ],
    exports: [['weightRows', 0], ['gramTiles', 1]],
  };
}

interface NormalKernels {
  weightRows(plain: number, weighted: number, w: number, rows: number): void;
  gramTiles(weighted: number, plain: number, pRows: number, sums: number, sumRowBytes: number): void;
}

/** Whether the WebAssembly SIMD kernels run here; where not, SimdNormalEquations runs the JavaScript twin. */
export const SIMD_NORMAL_EQUATIONS_AVAILABLE = compileWasmModule(moduleSpec(3)) !== null;

/** The compiled modules by row length n (a run meets one or two). */
const modulesByRowLength = new Map<number, WebAssembly.Module>();

function moduleFor(n: number): WebAssembly.Module {
  let module = modulesByRowLength.get(n);
  if (module === undefined) {
    module = compileWasmModule(moduleSpec(n))!;
    modulesByRowLength.set(n, module);
  }
  return module;
}

/**
 * weightedNormalEquations (its JavaScript twin, the reference) on f64x2 vectors: the same
 * results to the bit. The basis rows, then d as one more row, are copied into the kernels' own
 * memory (one copy of the whole array; 0.06 ms for 67 x 5,160 values), weighted by w there, and
 * the lower triangle of the Gram matrix of [B; d] with weights w is summed in tiles of 4 x 2
 * entries; its last row is b. The memory is made at the first call and when k or n changes, so
 * a call allocates nothing (unless the basis holds more than k n values, or w or d more than n:
 * then it makes a view of their first values).
 */
export class SimdNormalEquations {
  private kernels: NormalKernels | null = null;
  private k = -1;
  private n = -1;
  /** k + 1 rounded up to whole tiles: the rows of the plain and weighted copies and of the sums. */
  private rows = 0;
  private plain: Float64Array = new Float64Array(0);
  private weighted: Float64Array = new Float64Array(0);
  private weight: Float64Array = new Float64Array(0);
  private sums: Float64Array = new Float64Array(0);
  /** The JavaScript twin's scratch, where WebAssembly SIMD is not available. */
  private scratch = new Float64Array(0);

  /** The arguments and results of weightedNormalEquations (lower triangle of `normal`, and `rhs`). */
  assemble(basis: Float64Array, k: number, n: number, w: Float64Array, d: Float64Array, normal: Float64Array, rhs: Float64Array): void {
    if (!SIMD_NORMAL_EQUATIONS_AVAILABLE) {
      if (this.scratch.length < n) this.scratch = new Float64Array(n);
      weightedNormalEquations(basis, k, n, w, d, normal, rhs, this.scratch);
      return;
    }
    if (k !== this.k || n !== this.n) this.reserve(k, n);
    const { plain, sums, rows } = this;
    plain.set(basis.length === k * n ? basis : basis.subarray(0, k * n));
    plain.set(d.length === n ? d : d.subarray(0, n), k * n);
    this.weight.set(w.length === n ? w : w.subarray(0, n));
    const kernels = this.kernels!;
    kernels.weightRows(plain.byteOffset, this.weighted.byteOffset, this.weight.byteOffset, k + 1);
    kernels.gramTiles(this.weighted.byteOffset, plain.byteOffset, k + 1, sums.byteOffset, 16 * rows);
    for (let p = 0; p < k; p++) {
      for (let q = 0; q <= p; q++) normal[p * k + q] = sums[2 * (p * rows + q)] + sums[2 * (p * rows + q) + 1];
    }
    for (let q = 0; q < k; q++) rhs[q] = sums[2 * (k * rows + q)] + sums[2 * (k * rows + q) + 1];
  }

  /** A zeroed memory for k basis rows of n points, and its views: plain rows, weighted rows, w, sums. */
  private reserve(k: number, n: number): void {
    const rows = Math.ceil((k + 1) / TILE_P) * TILE_P;
    const lengths = [rows * n, rows * n, n, 2 * rows * rows];
    const { memory, starts } = memoryWithRegions(lengths.map((length) => 8 * length));
    this.kernels = new WebAssembly.Instance(moduleFor(n), { env: { memory } }).exports as unknown as NormalKernels;
    [this.plain, this.weighted, this.weight, this.sums] = lengths.map((length, j) => new Float64Array(memory.buffer, starts[j], length));
    this.k = k;
    this.n = n;
    this.rows = rows;
  }
}
