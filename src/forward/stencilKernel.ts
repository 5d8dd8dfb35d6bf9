import { WASM_TYPE, compileWasmModule, element, emitter, integer, op } from '../numeric/wasm/wasmModuleBytes.js';
import { memoryWithRegions } from '../numeric/wasm/wasmMemory.js';

/**
 * LatticeStencil's two passes as WebAssembly functions (scalar): the same operations in the same
 * order as its JavaScript loops, so the same means, centre values, flags and live list to the bit
 * (SIMD is used only to do two lanes' identical operations at once).
 * The constants in memory (`weights`, f64): the 3-point centre and neighbour weights, the three
 * fourth-order weights, the guard weight and the hopeless factor.
 */
const WEIGHTS = 7;
/** After them, the extrapolation's four constants (extrapolateBody). */
const EXTRAPOLATION_CONSTANTS = 4;

const { at, i32At, f64At } = element;
const get = op.localGet, set = op.localSet;
const { plus, minus, increment } = integer;

/**
 * rowStencils(values, rowPoints, rowCount, rows, weights, base): for each row point r, the x
 * stencils' second-order part w30 c + w31 (v[-1] + v[+1]) into rows[2 r] and fourth-order part
 * d0 c + d1 (v[-1] + v[+1]) + d2 (v[-2] + v[+2]) into rows[2 r + 1], c and v read from values
 * at base + r. The two parts of a point side by side make one f64x2 for the y pass. Addresses
 * are byte addresses.
 */
function rowBody(): number[] {
  const [values, rowPoints, rowCount, rows, weights, base] = [0, 1, 2, 3, 4, 5];
  const [t, r, q] = [6, 7, 8];
  const [centre, near, w30, w31, d0, d1, d2] = [9, 10, 11, 12, 13, 14, 15];
  const body: number[] = [];
  const emit = emitter(body);
  const value = (offset: number): number[] => f64At(values, plus(get(q), op.i32Const(offset)));
  [w30, w31, d0, d1, d2].forEach((local, i) => emit(f64At(weights, op.i32Const(i)), set(local)));
  emit(op.i32Const(0), set(t));
  emit(op.block, op.loop, get(t), get(rowCount), op.i32GeS, op.brIf(1));
  emit(i32At(rowPoints, get(t)), set(r), plus(get(base), get(r)), set(q));
  emit(value(0), set(centre), value(-1), value(1), op.f64Add, set(near));
  emit(at(rows, get(r), 4), get(w30), get(centre), op.f64Mul, get(w31), get(near), op.f64Mul, op.f64Add, op.f64Store(0));
  emit(at(rows, get(r), 4), get(d0), get(centre), op.f64Mul, get(d1), get(near), op.f64Mul, op.f64Add);
  emit(get(d2), value(-2), value(2), op.f64Add, op.f64Mul, op.f64Add, op.f64Store(8));
  emit(increment(t), op.br(0), op.end, op.end);
  return body;
}

/**
 * pixelStencils(values, pixelsPadded, live, liveCount, rows, means, previous, flags, tolerance,
 * scale, weights, width, base, k, count): LatticeStencil.pixelStencils (see there) for basis k on
 * the plane at `base`, the y stencils of both row parts in one f64x2 (each lane the JavaScript's
 * operations in its order); returns the number of pixels left live.
 */
function pixelBody(): number[] {
  const [values, pixelsPadded, live, liveCount, rows, means, previous, flags, tolerance, scale, weights,
    width, base, k, count] = Array.from({ length: 15 }, (_, i) => i);
  const [t, e, q, kept, out, width2] = Array.from({ length: 6 }, (_, i) => 15 + i);
  const [guard, hopeless, second, partX, partY, partXY, centre, indicator, limit] = Array.from({ length: 9 }, (_, i) => 21 + i);
  const [w30, w31, d0, d1, d2, v0, v1, v2, low, high] = Array.from({ length: 10 }, (_, i) => 30 + i);
  const body: number[] = [];
  const emit = emitter(body);
  // The (second, fourth) pair of the x stencils at q + offset, and the sum of those at q - d and q + d.
  const point = (offset: number[]): number[] => [...at(rows, offset, 4), ...op.v128Load(0)];
  const pair = (d: number): number[] =>
    [...point(minus(get(q), get(d))), ...point(plus(get(q), get(d))), ...op.f64x2Add];
  const splat = (local: number, i: number): number[] => [...f64At(weights, op.i32Const(i)), ...op.f64x2Splat, ...set(local)];
  const times = (w: number, v: number): number[] => [...get(w), ...get(v), ...op.f64x2Mul];
  emit(splat(w30, 0), splat(w31, 1), splat(d0, 2), splat(d1, 3), splat(d2, 4));
  emit(f64At(weights, op.i32Const(5)), set(guard), f64At(weights, op.i32Const(6)), set(hopeless));
  emit(get(width), get(width), op.i32Add, set(width2));
  emit(get(k), get(count), op.i32Mul, set(out));
  emit(op.i32Const(0), set(t), op.i32Const(0), set(kept));
  emit(op.block, op.loop, get(t), get(liveCount), op.i32GeS, op.brIf(1));
  emit(op.block);
  emit(i32At(live, get(t)), set(e), i32At(pixelsPadded, get(e)), set(q));
  emit(f64At(values, plus(get(base), get(q))), set(centre));
  emit(point(get(q)), set(v0), pair(width), set(v1), pair(width2), set(v2));
  // Lane 0 the second-order row parts, lane 1 the fourth-order ones: (second, partX) and (partY, partXY).
  emit(times(w30, v0), times(w31, v1), op.f64x2Add, set(low));
  emit(times(d0, v0), times(d1, v1), op.f64x2Add, times(d2, v2), op.f64x2Add, set(high));
  emit(get(low), op.f64x2ExtractLane(0), set(second), get(low), op.f64x2ExtractLane(1), set(partX));
  emit(get(high), op.f64x2ExtractLane(0), set(partY), get(high), op.f64x2ExtractLane(1), set(partXY));
  emit(at(means, plus(get(out), get(e)), 3), get(second), get(partX), op.f64Add, get(partY), op.f64Add, get(partXY), op.f64Add, op.f64Store(0));
  emit(at(previous, plus(get(out), get(e)), 3), get(centre), op.f64Store(0));
  emit(get(partX), op.f64Abs, get(partY), op.f64Abs, op.f64Add, get(partXY), op.f64Abs, op.f64Add);
  emit(get(guard), get(second), get(centre), op.f64Sub, op.f64Abs, op.f64Mul, op.f64Max, set(indicator));
  emit(f64At(scale, get(k)), f64At(tolerance, get(e)), op.f64Mul, set(limit));
  // Above HOPELESS tolerances: STRAIGHT_TO_FULL (2), and the pixel leaves the live list.
  emit(op.block, get(indicator), get(hopeless), get(limit), op.f64Mul, op.f64Gt, op.i32Eqz, op.brIf(0));
  emit(at(flags, get(e), 2), op.i32Const(2), op.i32Store(0), op.br(1), op.end);
  // Above the tolerance: REFINE (1).
  emit(op.block, get(indicator), get(limit), op.f64Gt, op.i32Eqz, op.brIf(0));
  emit(at(flags, get(e), 2), op.i32Const(1), op.i32Store(0), op.end);
  emit(at(live, get(kept), 2), get(e), op.i32Store(0), increment(kept));
  emit(op.end);
  emit(increment(t), op.br(0), op.end, op.end);
  emit(get(kept));
  return body;
}

/**
 * scatterPlane(out, padded, listed, n, values, base, from): PixelLattice.scatterValues (see there)
 * for the lattice light at out[from ..], listed as i32 0 or 1; returns the brightest listed pixel.
 */
function scatterBody(): number[] {
  const [out, padded, listed, n, values, base, from] = [0, 1, 2, 3, 4, 5, 6];
  const [e, q, brightest] = [7, 8, 9];
  const [value, size, peak] = [10, 11, 12];
  const body: number[] = [];
  const emit = emitter(body);
  emit(op.i32Const(-1), set(brightest), op.f64Const(-1), set(peak), op.i32Const(0), set(e));
  emit(op.block, op.loop, get(e), get(n), op.i32GeS, op.brIf(1));
  emit(f64At(out, plus(get(from), get(e))), set(value), i32At(padded, get(e)), set(q));
  emit(at(values, plus(get(base), get(q)), 3), get(value), op.f64Store(0));
  emit(get(value), op.f64Abs, set(size));
  emit(op.block, get(size), get(peak), op.f64Gt, i32At(listed, get(e)), op.i32And, op.i32Eqz, op.brIf(0));
  emit(get(size), set(peak), get(q), set(brightest), op.end);
  emit(increment(e), op.br(0), op.end, op.end);
  emit(get(brightest));
  return body;
}

/**
 * extrapolate(means, previous, current, pending, pendingCount, flags, tolerance, scale, weights,
 * count, basisCount): RichardsonRefinement's extrapolation (see there) of the pending pixels, with
 * its factor, convergence, guard and hopeless factor at weights[7 ..]; each pixel flagged.
 */
function extrapolateBody(): number[] {
  const [means, previous, current, pending, pendingCount, flags, tolerance, scale, weights, count, basisCount]
    = Array.from({ length: 11 }, (_, i) => i);
  const [t, e, k, index, refine, hopelessFlag] = Array.from({ length: 6 }, (_, i) => 11 + i);
  const [factor, convergence, guard, hopeless, now, step, predicted, indicator, limit, rate]
    = Array.from({ length: 10 }, (_, i) => 17 + i);
  const body: number[] = [];
  const emit = emitter(body);
  [factor, convergence, guard, hopeless].forEach((local, i) => emit(f64At(weights, op.i32Const(WEIGHTS + i)), set(local)));
  emit(op.i32Const(0), set(t));
  emit(op.block, op.loop, get(t), get(pendingCount), op.i32GeS, op.brIf(1));
  emit(i32At(pending, get(t)), set(e), op.i32Const(0), set(refine), op.i32Const(0), set(hopelessFlag));
  emit(f64At(tolerance, get(e)), set(rate), op.i32Const(0), set(k));
  emit(op.block, op.loop, get(k), get(basisCount), op.i32GeS, op.brIf(1));
  emit(get(k), get(count), op.i32Mul, get(e), op.i32Add, set(index));
  emit(f64At(current, get(index)), set(now));
  emit(get(now), f64At(previous, get(index)), op.f64Sub, get(factor), op.f64Mul, set(step));
  emit(get(now), get(step), op.f64Add, set(predicted));
  emit(get(convergence), get(predicted), f64At(means, get(index)), op.f64Sub, op.f64Abs, op.f64Mul);
  emit(get(guard), get(step), op.f64Abs, op.f64Mul, op.f64Max, set(indicator));
  emit(f64At(scale, get(k)), get(rate), op.f64Mul, set(limit));
  emit(get(refine), get(indicator), get(limit), op.f64Gt, op.i32Or, set(refine));
  emit(get(hopelessFlag), get(indicator), get(hopeless), get(limit), op.f64Mul, op.f64Gt, op.i32Or, set(hopelessFlag));
  emit(at(means, get(index), 3), get(predicted), op.f64Store(0));
  emit(at(previous, get(index), 3), get(now), op.f64Store(0));
  emit(increment(k), op.br(0), op.end, op.end);
  // STRAIGHT_TO_FULL (2) if hopeless, else REFINE (1) or DONE (0).
  emit(at(flags, get(e), 2), get(hopelessFlag), op.i32Const(1), op.i32Shl, get(refine), get(hopelessFlag), op.i32Eqz, op.i32And, op.i32Add, op.i32Store(0));
  emit(increment(t), op.br(0), op.end, op.end);
  return body;
}

const i32 = WASM_TYPE.i32, f64 = WASM_TYPE.f64;

/** The compiled module, or null where the engine has no WebAssembly (LatticeStencil then runs its JavaScript loops). */
export const stencilModule = compileWasmModule({
  types: [[new Array<number>(6).fill(i32), []], [new Array<number>(15).fill(i32), [i32]], [new Array<number>(7).fill(i32), [i32]],
    [new Array<number>(11).fill(i32), []]],
  functions: [
    { type: 0, locals: [[3, i32], [7, f64]], body: rowBody() },
    { type: 1, locals: [[6, i32], [9, f64], [10, WASM_TYPE.v128]], body: pixelBody() },
    { type: 2, locals: [[3, i32], [3, f64]], body: scatterBody() },
    { type: 3, locals: [[6, i32], [10, f64]], body: extrapolateBody() },
  ],
  exports: [['rowStencils', 0], ['pixelStencils', 1], ['scatterPlane', 2], ['extrapolate', 3]],
});

type ScatterPass = (out: number, padded: number, listed: number, n: number, values: number, base: number, from: number) => number;
type ExtrapolatePass = (
  means: number, previous: number, current: number, pending: number, pendingCount: number, flags: number,
  tolerance: number, scale: number, weights: number, count: number, basisCount: number,
) => void;
type RowPass = (values: number, rowPoints: number, rowCount: number, rows: number, weights: number, base: number) => void;
type PixelPass = (
  values: number, pixelsPadded: number, live: number, liveCount: number, rows: number,
  means: number, previous: number, flags: number, tolerance: number, scale: number, weights: number,
  width: number, base: number, k: number, count: number,
) => number;

/**
 * The lattice level's buffers in one WebAssembly memory, for `count` listed pixels, `basisCount`
 * bases and padded planes of `planeSize` points: PixelLattice's light (`out`, room for a lattice
 * of planeSize rays) and planes (`values`), PixelMeanState's means (current, previous and
 * predicted), pending list, flags, scales and tolerances, and the stencil's own rows, live list, the lattice's ray and pixel lists and
 * the weights. The owners take these views in place of their own arrays, so
 * the JavaScript that reads or writes them is unchanged.
 */
export class StencilMemory {
  readonly values: Float64Array;
  readonly means: Float64Array;
  readonly previous: Float64Array;
  readonly flags: Int32Array;
  readonly scale: Float64Array;
  readonly relativeTolerance: Float64Array;
  /** The x stencils' two parts at each padded point, interleaved (see rowStencils). */
  readonly rows: Float64Array;
  readonly live: Int32Array;
  readonly pixelsPadded: Int32Array;
  readonly rowPoints: Int32Array;
  readonly weights: Float64Array;
  readonly out: Float64Array;
  /** The lattice's rays' padded indices, and 1 where a ray is through a listed pixel (else 0). */
  readonly padded: Int32Array;
  readonly listed: Int32Array;
  /** PixelMeanState's means at the current factor and its pending list. */
  readonly current: Float64Array;
  readonly pending: Int32Array;
  private readonly addresses: readonly number[];
  private readonly rowPass: RowPass;
  private readonly pixelPass: PixelPass;
  private readonly scatterPass: ScatterPass;
  private readonly extrapolatePass: ExtrapolatePass;

  constructor(count: number, basisCount: number, planeSize: number) {
    const planes = Math.max(1, basisCount);
    const { memory, starts } = memoryWithRegions([
      8 * planes * planeSize, 8 * basisCount * count, 8 * basisCount * count, 4 * count, 8 * basisCount, 8 * count,
      16 * planeSize, 4 * count, 4 * count, 4 * planeSize, 8 * (WEIGHTS + EXTRAPOLATION_CONSTANTS),
      8 * planes * planeSize, 4 * planeSize, 4 * planeSize, 8 * basisCount * count, 4 * count,
    ]);
    const buffer = memory.buffer;
    this.addresses = starts;
    this.values = new Float64Array(buffer, starts[0], planes * planeSize);
    this.means = new Float64Array(buffer, starts[1], basisCount * count);
    this.previous = new Float64Array(buffer, starts[2], basisCount * count);
    this.flags = new Int32Array(buffer, starts[3], count);
    this.scale = new Float64Array(buffer, starts[4], basisCount);
    this.relativeTolerance = new Float64Array(buffer, starts[5], count);
    this.rows = new Float64Array(buffer, starts[6], 2 * planeSize);
    this.live = new Int32Array(buffer, starts[7], count);
    this.pixelsPadded = new Int32Array(buffer, starts[8], count);
    this.rowPoints = new Int32Array(buffer, starts[9], planeSize);
    this.weights = new Float64Array(buffer, starts[10], WEIGHTS + EXTRAPOLATION_CONSTANTS);
    this.out = new Float64Array(buffer, starts[11], planes * planeSize);
    this.padded = new Int32Array(buffer, starts[12], planeSize);
    this.listed = new Int32Array(buffer, starts[13], planeSize);
    this.current = new Float64Array(buffer, starts[14], basisCount * count);
    this.pending = new Int32Array(buffer, starts[15], count);
    const exports = new WebAssembly.Instance(stencilModule!, { env: { memory } }).exports;
    this.rowPass = exports.rowStencils as RowPass;
    this.pixelPass = exports.pixelStencils as PixelPass;
    this.scatterPass = exports.scatterPlane as ScatterPass;
    this.extrapolatePass = exports.extrapolate as ExtrapolatePass;
  }

  /**
   * RichardsonRefinement's extrapolation of the first pendingCount pending pixels with the given
   * constants (its factor and convergence for the level, its guard and the hopeless factor).
   */
  extrapolate(pendingCount: number, factor: number, convergence: number, guard: number, hopeless: number): void {
    const s = this.addresses;
    const constants = this.weights;
    constants[WEIGHTS] = factor;
    constants[WEIGHTS + 1] = convergence;
    constants[WEIGHTS + 2] = guard;
    constants[WEIGHTS + 3] = hopeless;
    const basisCount = this.scale.length;
    this.extrapolatePass(s[1], s[2], s[14], s[15], pendingCount, s[3], s[5], s[4], s[10], this.flags.length, basisCount);
  }

  /**
   * The lattice light of basis k (n rays, at out[k * n ..]) onto the plane at `base`; returns the
   * padded index of the brightest listed pixel (-1 if none).
   */
  scatterPlane(k: number, base: number, n: number): number {
    const s = this.addresses;
    return this.scatterPass(s[11], s[12], s[13], n, s[0], base, k * n);
  }

  /** The x pass over the first rowCount row points of `rowPoints` on the plane at `base`. */
  rowStencils(rowCount: number, base: number): void {
    const s = this.addresses;
    this.rowPass(s[0], s[9], rowCount, s[6], s[10], base);
  }

  /** The y pass of basis k over the first liveCount live pixels; returns how many stay live. */
  pixelStencils(k: number, base: number, liveCount: number, width: number): number {
    const s = this.addresses;
    return this.pixelPass(s[0], s[8], s[7], liveCount, s[6], s[1], s[2], s[3], s[5], s[4], s[10], width, base, k, this.flags.length);
  }
}
