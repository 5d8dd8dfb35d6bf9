import { WASM_TYPE, op, wasmModuleBytes } from '../wasm/wasmModuleBytes.js';

/** The dense kernels that run as WebAssembly SIMD on a Float64Array held in their own memory. */
export interface SimdTileKernels {
  /**
   * Rows iFrom .. iEnd - 1 (a multiple of 4 apart) of columns j .. j + 3 of the column-major
   * array at byte `base` (leading dimension ld) less the products of their panel rows:
   * a[i, j + c] -= sum_p a[i, p] a[j + c, p] over p = panel .. panel + width - 1.
   */
  rankUpdateColumns(base: number, ld: number, j: number, iFrom: number, iEnd: number, panel: number, width: number): void;
}

const WASM_PAGE_BYTES = 65536;

/**
 * The rank update of a column block as a WebAssembly function on f64x2 vectors (the register
 * blocking of Goto & van de Geijn 2008, ACM Trans. Math. Software 34, 12, as in productTile:
 * a 4 x 4 block of sums in eight two-lane registers, each panel value loaded once per block).
 * Every lane adds its products in the same order as productTile, so the results are the same
 * to the bit. Parameters (i32): base, ld, j, iFrom, iEnd, panel, width.
 */
function rankUpdateBody(): number[] {
  const [base, ld, j, iFrom, iEnd, panel, width, i, pa, pb, stride, q, pc] = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
  const sum = (k: number): number => 13 + k;
  const [a01, a23, b] = [21, 22, 23];
  const body: number[] = [];
  const emit = (...parts: number[][]): void => { for (const part of parts) body.push(...part); };
  // Byte address of element (row, column): base + ((column * ld + row) << 3).
  const address = (column: number, row: number): number[] => [
    ...op.localGet(base), ...op.localGet(column), ...op.localGet(ld), ...op.i32Mul, ...op.localGet(row), ...op.i32Add,
    ...op.i32Const(3), ...op.i32Shl, ...op.i32Add,
  ];
  emit(op.localGet(ld), op.i32Const(3), op.i32Shl, op.localSet(stride), op.localGet(iFrom), op.localSet(i));
  emit(op.block, op.loop, op.localGet(i), op.localGet(iEnd), op.i32GeS, op.brIf(1));
  for (let k = 0; k < 8; k++) emit(op.v128Zero, op.localSet(sum(k)));
  emit(address(panel, i), op.localSet(pa), address(panel, j), op.localSet(pb), op.localGet(width), op.localSet(q));
  emit(op.block, op.loop, op.localGet(q), op.i32Eqz, op.brIf(1));
  emit(op.localGet(pa), op.v128Load(0), op.localSet(a01), op.localGet(pa), op.v128Load(16), op.localSet(a23));
  for (let c = 0; c < 4; c++) {
    emit(op.localGet(pb), op.v128Load64Splat(8 * c), op.localSet(b));
    emit(op.localGet(sum(2 * c)), op.localGet(a01), op.localGet(b), op.f64x2Mul, op.f64x2Add, op.localSet(sum(2 * c)));
    emit(op.localGet(sum(2 * c + 1)), op.localGet(a23), op.localGet(b), op.f64x2Mul, op.f64x2Add, op.localSet(sum(2 * c + 1)));
  }
  emit(op.localGet(pa), op.localGet(stride), op.i32Add, op.localSet(pa));
  emit(op.localGet(pb), op.localGet(stride), op.i32Add, op.localSet(pb));
  emit(op.localGet(q), op.i32Const(1), op.i32Sub, op.localSet(q), op.br(0), op.end, op.end);
  emit(address(j, i), op.localSet(pc));
  for (let c = 0; c < 4; c++) {
    for (let half = 0; half < 2; half++) {
      emit(op.localGet(pc), op.localGet(pc), op.v128Load(16 * half), op.localGet(sum(2 * c + half)), op.f64x2Sub, op.v128Store(16 * half));
    }
    emit(op.localGet(pc), op.localGet(stride), op.i32Add, op.localSet(pc));
  }
  emit(op.localGet(i), op.i32Const(4), op.i32Add, op.localSet(i), op.br(0), op.end, op.end);
  return body;
}

const I32 = WASM_TYPE.i32;

/** The compiled module, or null where WebAssembly SIMD is not available (the JavaScript kernels run instead). */
const compiled: WebAssembly.Module | null = (() => {
  const bytes = wasmModuleBytes({
    types: [[[I32, I32, I32, I32, I32, I32, I32], []]],
    functions: [{ type: 0, locals: [[6, I32], [11, WASM_TYPE.v128]], body: rankUpdateBody() }],
    exports: [['rankUpdateColumns', 0]],
  });
  return typeof WebAssembly === 'object' && WebAssembly.validate(bytes) ? new WebAssembly.Module(bytes) : null;
})();

/** The kernels bound to each memory's buffer. */
const kernelsByBuffer = new WeakMap<ArrayBufferLike, SimdTileKernels>();

/** The SIMD kernels that work on `a` in place, or undefined when `a` is an ordinary array. */
export function simdKernelsOf(a: Float64Array): SimdTileKernels | undefined {
  return kernelsByBuffer.get(a.buffer);
}

/**
 * `a` when it holds at least `n` values, else a new zeroed array of at least n values in a
 * memory of its own with the SIMD kernels bound to it (an ordinary Float64Array where
 * WebAssembly SIMD is not available). Like ensureFloat64Capacity, the contents are not kept.
 */
export function ensureSimdFloat64Capacity(a: Float64Array<ArrayBuffer>, n: number): Float64Array<ArrayBuffer> {
  if (a.length >= n && (compiled === null || simdKernelsOf(a) !== undefined)) return a;
  const length = Math.max(n, Math.ceil(a.length * 1.5), 1);
  if (compiled === null) return new Float64Array(length);
  const memory = new WebAssembly.Memory({ initial: Math.ceil((8 * length) / WASM_PAGE_BYTES) });
  const instance = new WebAssembly.Instance(compiled, { env: { memory } });
  kernelsByBuffer.set(memory.buffer, instance.exports as unknown as SimdTileKernels);
  return new Float64Array(memory.buffer, 0, length);
}
