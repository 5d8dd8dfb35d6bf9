import { WASM_TYPE, compileWasmModule, emitter, op, type Emit } from '../numeric/wasm/wasmModuleBytes.js';

/**
 * PixelSubsetConvolver's passes on two images at once, as WebAssembly functions: the images are
 * interleaved (pixel q of image 0 and of image 1 are the f64x2 pair at byte 16 q of a plane), so
 * each lane does, step for step, what the JavaScript pass does for one image (the same products
 * and sums in the same order: the same bits), and one load serves both. All parameters are i32:
 * byte addresses of an i32 point list and of the planes and factors, then counts and strides.
 * The separable passes take two points per step: their point counts must be even (the
 * convolver's lists are; see evenLength there).
 * - mirroredX(points, count, input, pass, factor, half): pass[q] = centre input[q] +
 *   sum_(a=1..half) w[half - a] (input[q - a] + input[q + a]), centre = w[half];
 * - mirroredY(points, count, pass, sums, factor, half, widthPairs): the same along y (neighbours
 *   widthPairs pairs apart) at the outputs, into sums[e];
 * - generalX(points, count, input, pass, factor, taps, half): pass[q] = sum_a w[a] input[q + half - a];
 * - generalY(points, count, pass, sums, factor, taps, half, widthPairs): sums[e] =
 *   sum_b w[b] pass[q + (half - b) width];
 * - direct(points, count, input, sums, offsets, weights, taps): sums[e] = sum_k w[k] input[q + offsets[k]].
 */
const i32 = WASM_TYPE.i32, v128 = WASM_TYPE.v128;

/** The locals of a two-point pass from `base` on: seven i32, then three v128. */
function twoPointLocals(base: number) {
  const [e, a, q0, q1, step, at0, at1, sum0, sum1, w] = Array.from({ length: 10 }, (_, i) => base + i);
  return { e, a, q0, q1, step, at0, at1, sum0, sum1, w };
}

/** Helpers over one function body. */
function bodyTools(emit: Emit) {
  const get = op.localGet, set = op.localSet;
  const pairAddressOf = (base: number, index: number[]): number[] => [...get(base), ...index, ...op.i32Const(4), ...op.i32Shl, ...op.i32Add];
  return {
    get, set,
    /** base + 16 * index (index an i32 expression). */
    pairAddress: pairAddressOf,
    /** The i32 at points + 4 e. */
    pointAt: (points: number, e: number): number[] => [...get(points), ...get(e), ...op.i32Const(2), ...op.i32Shl, ...op.i32Add, ...op.i32Load(0)],
    /** The factor's value at weights + 8 index, in both lanes. */
    weightSplat: (weights: number, index: number[]): number[] => [...get(weights), ...index, ...op.i32Const(3), ...op.i32Shl, ...op.i32Add, ...op.v128Load64Splat(0)],
    /** q0, q1 = points[e], points[e + 1]. */
    twoPoints: (points: number, e: number, q0: number, q1: number): void => {
      emit(get(points), get(e), op.i32Const(2), op.i32Shl, op.i32Add, set(q0));
      emit(get(q0), op.i32Load(4), set(q1), get(q0), op.i32Load(0), set(q0));
    },
    /** The two sums into the pairs e and e + 1 (alongY: the outputs' sums) or q0 and q1 (the pass plane). */
    storeTwo: (alongY: boolean, into: number, e: number, q0: number, q1: number, sum0: number, sum1: number): void => {
      if (alongY) emit(pairAddressOf(into, get(e)), get(sum0), op.v128Store(0), pairAddressOf(into, get(e)), get(sum1), op.v128Store(16));
      else emit(pairAddressOf(into, get(q0)), get(sum0), op.v128Store(0), pairAddressOf(into, get(q1)), get(sum1), op.v128Store(0));
      emit(get(e), op.i32Const(1), op.i32Add, set(e));
    },
    /** for (local = from; local < bound; local++) inner(), the exit at depth 1. */
    countedLoop: (local: number, from: number[], bound: number[], inner: () => void): void => {
      emit(from, set(local), op.block, op.loop, get(local), bound, op.i32GeS, op.brIf(1));
      inner();
      emit(get(local), op.i32Const(1), op.i32Add, set(local), op.br(0), op.end, op.end);
    },
  };
}

/**
 * mirroredX and mirroredY. Two points per step, as the JavaScript passes go (their sums
 * overlap instead of each waiting on its last addition); the point count must be even.
 */
function mirroredBody(alongY: boolean): number[] {
  const [points, count, from, into, factor, half] = [0, 1, 2, 3, 4, 5];
  const widthPairs = 6;
  const { e, a, q0, q1, step, at0, at1, sum0, sum1, w } = twoPointLocals(alongY ? 7 : 6);
  const body: number[] = [];
  const emit = emitter(body);
  const t = bodyTools(emit);
  t.countedLoop(e, op.i32Const(0), t.get(count), () => {
    t.twoPoints(points, e, q0, q1);
    emit(t.pairAddress(from, t.get(q0)), t.set(at0), t.pairAddress(from, t.get(q1)), t.set(at1));
    emit(t.weightSplat(factor, t.get(half)), t.set(w));
    emit(t.get(w), t.get(at0), op.v128Load(0), op.f64x2Mul, t.set(sum0));
    emit(t.get(w), t.get(at1), op.v128Load(0), op.f64x2Mul, t.set(sum1));
    // step: the byte distance of neighbour a (a pairs along x, a rows along y).
    emit(op.i32Const(0), t.set(step));
    t.countedLoop(a, op.i32Const(1), [...t.get(half), ...op.i32Const(1), ...op.i32Add], () => {
      emit(t.get(step), alongY ? t.get(widthPairs) : op.i32Const(1), op.i32Const(4), op.i32Shl, op.i32Add, t.set(step));
      emit(t.weightSplat(factor, [...t.get(half), ...t.get(a), ...op.i32Sub]), t.set(w));
      for (const [sum, at] of [[sum0, at0], [sum1, at1]]) {
        emit(t.get(sum), t.get(w), t.get(at), t.get(step), op.i32Sub, op.v128Load(0), t.get(at), t.get(step), op.i32Add, op.v128Load(0), op.f64x2Add);
        emit(op.f64x2Mul, op.f64x2Add, t.set(sum));
      }
    });
    t.storeTwo(alongY, into, e, q0, q1, sum0, sum1);
  });
  return body;
}

/** generalX and generalY, two points per step (see mirroredBody). */
function generalBody(alongY: boolean): number[] {
  const [points, count, from, into, factor, taps, half] = [0, 1, 2, 3, 4, 5, 6];
  const widthPairs = 7;
  const { e, a, q0, q1, step, at0, at1, sum0, sum1, w } = twoPointLocals(alongY ? 8 : 7);
  const body: number[] = [];
  const emit = emitter(body);
  const t = bodyTools(emit);
  // step: the byte distance from one tap's input to the next (back one pair, or one row).
  if (alongY) emit(op.i32Const(0), t.get(widthPairs), op.i32Const(4), op.i32Shl, op.i32Sub, t.set(step));
  else emit(op.i32Const(-16), t.set(step));
  t.countedLoop(e, op.i32Const(0), t.get(count), () => {
    t.twoPoints(points, e, q0, q1);
    // The first tap's input: q + half along x, q + half rows along y.
    emit(t.pairAddress(from, t.get(q0)), t.get(half), t.get(step), op.i32Mul, op.i32Sub, t.set(at0));
    emit(t.pairAddress(from, t.get(q1)), t.get(half), t.get(step), op.i32Mul, op.i32Sub, t.set(at1));
    emit(op.v128Zero, t.set(sum0), op.v128Zero, t.set(sum1));
    t.countedLoop(a, op.i32Const(0), t.get(taps), () => {
      emit(t.weightSplat(factor, t.get(a)), t.set(w));
      emit(t.get(sum0), t.get(w), t.get(at0), op.v128Load(0), op.f64x2Mul, op.f64x2Add, t.set(sum0));
      emit(t.get(sum1), t.get(w), t.get(at1), op.v128Load(0), op.f64x2Mul, op.f64x2Add, t.set(sum1));
      emit(t.get(at0), t.get(step), op.i32Add, t.set(at0), t.get(at1), t.get(step), op.i32Add, t.set(at1));
    });
    t.storeTwo(alongY, into, e, q0, q1, sum0, sum1);
  });
  return body;
}

function directBody(): number[] {
  const [points, count, input, sums, offsets, weights, taps] = [0, 1, 2, 3, 4, 5, 6];
  const [e, k, q] = [7, 8, 9];
  const sum = 10;
  const body: number[] = [];
  const emit = emitter(body);
  const t = bodyTools(emit);
  t.countedLoop(e, op.i32Const(0), t.get(count), () => {
    emit(t.pointAt(points, e), t.set(q), op.v128Zero, t.set(sum));
    t.countedLoop(k, op.i32Const(0), t.get(taps), () => {
      emit(t.get(sum), t.weightSplat(weights, t.get(k)));
      emit(t.pairAddress(input, [...t.get(q), ...t.pointAt(offsets, k), ...op.i32Add]), op.v128Load(0), op.f64x2Mul, op.f64x2Add, t.set(sum));
    });
    emit(t.pairAddress(sums, t.get(e)), t.get(sum), op.v128Store(0));
  });
  return body;
}

export type MirroredX = (points: number, count: number, input: number, pass: number, factor: number, half: number) => void;
export type MirroredY = (points: number, count: number, pass: number, sums: number, factor: number, half: number, widthPairs: number) => void;
export type GeneralX = (points: number, count: number, input: number, pass: number, factor: number, taps: number, half: number) => void;
export type GeneralY = (points: number, count: number, pass: number, sums: number, factor: number, taps: number, half: number, widthPairs: number) => void;
export type DirectPass = (points: number, count: number, input: number, sums: number, offsets: number, weights: number, taps: number) => void;

/** The compiled module, or null where the engine has no WebAssembly SIMD (the passes then run in JavaScript). */
export const pairedConvolutionModule = compileWasmModule({
  types: [
    [[i32, i32, i32, i32, i32, i32], []],
    [[i32, i32, i32, i32, i32, i32, i32], []],
    [[i32, i32, i32, i32, i32, i32, i32, i32], []],
  ],
  functions: [
    { type: 0, locals: [[7, i32], [3, v128]], body: mirroredBody(false) },
    { type: 1, locals: [[7, i32], [3, v128]], body: mirroredBody(true) },
    { type: 1, locals: [[7, i32], [3, v128]], body: generalBody(false) },
    { type: 2, locals: [[7, i32], [3, v128]], body: generalBody(true) },
    { type: 1, locals: [[3, i32], [1, v128]], body: directBody() },
  ],
  exports: [['mirroredX', 0], ['mirroredY', 1], ['generalX', 2], ['generalY', 3], ['direct', 4]],
});
