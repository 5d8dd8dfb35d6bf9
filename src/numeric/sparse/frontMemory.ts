import { WASM_TYPE, compileWasmModule, element, emitter, integer, op } from '../wasm/wasmModuleBytes.js';
import { memoryWithRegions, withHeadroom } from '../wasm/wasmMemory.js';
import { ensureFloat64Capacity, ensureInt32Capacity } from './ensureCapacity.js';
import { extendAdd } from './frontOperations.js';
import { bindSimdTileKernels } from './simdTileKernels.js';

/** Where the multifrontal fronts are extend-added: 'auto' in WebAssembly where the engine has it, 'javaScript' always in the twin. */
export type FrontEngine = 'auto' | 'javaScript';

/**
 * extendAdd of frontOperations.ts as one WebAssembly function: per column of the update matrix,
 * its runs of rows that land on consecutive front positions, each added two entries at a time
 * (f64x2) and a last odd entry alone. Every front entry still receives its one addition, so the
 * front is the same to the bit. Parameters (i32; front and update as byte addresses, relative
 * and runEnd as byte addresses of their element `from`): front, frontSize, update, ld, m,
 * relative, runEnd, from; then i32 j, i, end, pf, pu, count.
 */
function extendAddBody(): number[] {
  const [front, frontSize, update, ld, m, relative, runEnd, from, j, i, end, pf, pu, count] = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13];
  const body: number[] = [];
  const emit = emitter(body);
  // pf: the byte of (relative[i], relative[j]) in the front; pu: of (i, j) in the update.
  const frontByte = integer.plus(op.localGet(front), [
    ...integer.plus([...element.i32At(relative, op.localGet(j)), ...op.localGet(frontSize), ...op.i32Mul], element.i32At(relative, op.localGet(i))),
    ...op.i32Const(3), ...op.i32Shl,
  ]);
  const updateByte = integer.plus(op.localGet(update), [...op.localGet(j), ...op.localGet(ld), ...op.i32Mul, ...op.localGet(i), ...op.i32Add, ...op.i32Const(3), ...op.i32Shl]);
  const advance = (local: number, bytes: number): number[][] => [op.localGet(local), op.i32Const(bytes), op.i32Add, op.localSet(local)];
  emit(op.i32Const(0), op.localSet(j));
  emit(op.block, op.loop, op.localGet(j), op.localGet(m), op.i32GeS, op.brIf(1));
  emit(op.localGet(j), op.localSet(i));
  emit(op.block, op.loop, op.localGet(i), op.localGet(m), op.i32GeS, op.brIf(1));
  emit(element.i32At(runEnd, op.localGet(i)), op.localGet(from), op.i32Sub, op.localSet(end));
  emit(frontByte, op.localSet(pf), updateByte, op.localSet(pu));
  emit(op.localGet(end), op.localGet(i), op.i32Sub, op.localSet(count));
  emit(op.block, op.loop, op.localGet(count), op.i32Const(2), op.i32LtS, op.brIf(1));
  emit(op.localGet(pf), op.localGet(pf), op.v128Load(0), op.localGet(pu), op.v128Load(0), op.f64x2Add, op.v128Store(0));
  emit(...advance(pf, 16), ...advance(pu, 16), op.localGet(count), op.i32Const(2), op.i32Sub, op.localSet(count), op.br(0), op.end, op.end);
  emit(op.localGet(count), op.if);
  emit(op.localGet(pf), op.localGet(pf), op.f64Load(0), op.localGet(pu), op.f64Load(0), op.f64Add, op.f64Store(0));
  emit(op.end);
  emit(op.localGet(end), op.localSet(i), op.br(0), op.end, op.end);
  emit(integer.increment(j), op.br(0), op.end, op.end);
  return body;
}

const I32 = WASM_TYPE.i32;

/** The compiled module, or null where WebAssembly SIMD is not available (the JavaScript twin runs instead). */
const compiled = compileWasmModule({
  types: [[[I32, I32, I32, I32, I32, I32, I32, I32], []]],
  functions: [{ type: 0, locals: [[6, I32]], body: extendAddBody() }],
  exports: [['extendAdd', 0]],
});

type ExtendAddKernel = (front: number, frontSize: number, update: number, ld: number, m: number, relative: number, runEnd: number, from: number) => void;

/**
 * The working storage of MultifrontalCholesky's numeric pass in one WebAssembly memory: the two
 * alternating fronts, the stack of update matrices, and each child's relative rows and their
 * runs (copied from the analysis). The dense SIMD kernels (simdTileKernels.ts) are bound to it,
 * and the extend-add runs in its own kernel there, since a child's update (on the stack or in
 * the other front) and its parent's front now share the memory. Sized at each analysis; a new
 * memory only when an analysis needs more than the held one. With engine 'javaScript', or where
 * WebAssembly SIMD is missing, the same arrays are plain and frontOperations' extendAdd runs.
 */
export class FrontMemory {
  frontEven = new Float64Array(0);
  frontOdd = new Float64Array(0);
  stack = new Float64Array(0);
  relative = new Int32Array(0);
  runEnd = new Int32Array(0);
  private kernel: ExtendAddKernel | null = null;

  constructor(readonly engine: FrontEngine = 'auto') {}

  /** Room for two fronts of frontEntries, a stack of stackEntries and structureEntries relative rows; copies relative and runEnd in. */
  prepare(frontEntries: number, stackEntries: number, relative: Int32Array, runEnd: Int32Array, structureEntries: number): void {
    if (this.engine === 'javaScript' || compiled === null) {
      this.frontEven = ensureFloat64Capacity(this.frontEven, frontEntries);
      this.frontOdd = ensureFloat64Capacity(this.frontOdd, frontEntries);
      this.stack = ensureFloat64Capacity(this.stack, stackEntries);
      this.relative = ensureInt32Capacity(this.relative, structureEntries);
      this.runEnd = ensureInt32Capacity(this.runEnd, structureEntries);
    } else if (this.kernel === null || frontEntries > this.frontEven.length || stackEntries > this.stack.length || structureEntries > this.relative.length) {
      this.reserve(frontEntries, stackEntries, structureEntries);
    }
    this.relative.set(relative.subarray(0, structureEntries));
    this.runEnd.set(runEnd.subarray(0, structureEntries));
  }

  /** A fresh memory with a quarter more room than asked, its views and its kernels. */
  private reserve(frontEntries: number, stackEntries: number, structureEntries: number): void {
    const fronts = withHeadroom(frontEntries);
    const stacked = withHeadroom(stackEntries);
    const rows = withHeadroom(structureEntries);
    const { memory, starts } = memoryWithRegions([8 * fronts, 8 * fronts, 8 * stacked, 4 * rows, 4 * rows]);
    if (!bindSimdTileKernels(memory)) throw new Error('front memory: the SIMD tile kernels could not be bound');
    this.kernel = new WebAssembly.Instance(compiled!, { env: { memory } }).exports.extendAdd as ExtendAddKernel;
    const buffer = memory.buffer;
    this.frontEven = new Float64Array(buffer, starts[0], fronts);
    this.frontOdd = new Float64Array(buffer, starts[1], fronts);
    this.stack = new Float64Array(buffer, starts[2], stacked);
    this.relative = new Int32Array(buffer, starts[3], rows);
    this.runEnd = new Int32Array(buffer, starts[4], rows);
  }

  /**
   * frontOperations' extendAdd of the m x m update at update[at ..] (leading dimension ld; the
   * stack or the other front) into `front` (frontSize), the child's rows from `from`.
   */
  extendAdd(front: Float64Array, frontSize: number, update: Float64Array, at: number, ld: number, m: number, from: number): void {
    if (this.kernel === null) {
      extendAdd(front, frontSize, update, at, ld, m, this.relative, this.runEnd, from);
      return;
    }
    this.kernel(front.byteOffset, frontSize, update.byteOffset + 8 * at, ld, m, this.relative.byteOffset + 4 * from, this.runEnd.byteOffset + 4 * from, from);
  }
}
