import { WASM_TYPE, compileWasmModule, emitter, op, type WasmModuleSpec } from '../../numeric/wasm/wasmModuleBytes.js';
import { memoryWithRegions } from '../../numeric/wasm/wasmMemory.js';
import { HERMITE_BLOCK } from './hermiteBlock.js';
import { hermiteRecurrence } from './hermiteFunctions.js';
import { shapeletOrders } from './shapeletOrders.js';

const ROW_BYTES = 8 * HERMITE_BLOCK;
/** Bases per lane pair of a tile: two n1 rows per vector, up to two vectors by four n2 rows. */
const TILE_PAIRS = 2;
const TILE_COLUMNS = 4;

/** Byte addresses of the kernel's regions in its memory (the same for every instance of one order). */
interface KernelLayout {
  /** Hermite functions along x and along y, order-major: order k of point i at 8 (k HERMITE_BLOCK + i). */
  readonly alongX: number;
  readonly alongY: number;
  /** Scaled positions of one axis (the recurrence's u). */
  readonly u: number;
  /** scale * alongX point-major: order k of point i at 8 (i width + k), width even. */
  readonly pointMajor: number;
  /** Run sums: basis k of run t at 8 (t basisCount + k). */
  readonly sums: number;
  /** The scale (1 / beta), one f64. */
  readonly scale: number;
  /** Basis images of one block: basis k of point i at 8 (k HERMITE_BLOCK + i). */
  readonly products: number;
  readonly width: number;
  readonly byteLengths: readonly number[];
}

function layoutFor(maxOrder: number): KernelLayout {
  const orderCount = maxOrder + 1;
  const basisCount = (orderCount * (orderCount + 1)) / 2;
  const width = orderCount + (orderCount % 2);
  const byteLengths = [orderCount * ROW_BYTES, orderCount * ROW_BYTES, ROW_BYTES, width * ROW_BYTES, basisCount * ROW_BYTES, 8, basisCount * ROW_BYTES];
  const { starts } = memoryWithRegions(byteLengths);
  const [alongX, alongY, u, pointMajor, sums, scale, products] = starts;
  return { alongX, alongY, u, pointMajor, sums, scale, products, width, byteLengths };
}

/**
 * orders(table, u, size): hermiteOrders (hermiteBlock.ts) on f64x2 pairs of points, all orders
 * of a pair before the next pair, each value from the same operations in the same order (so the
 * same bits): phi_1 = (sqrt 2 u) phi_0, phi_(k+1) = (raising[k] u) phi_k - lowering[k] phi_(k-1).
 * Parameters (i32): byte addresses of the table (phi_0 in row 0) and of u, and the point count.
 * An odd count also fills the next point's column from whatever it holds (unused).
 */
function ordersBody(maxOrder: number): number[] {
  const [table, u, size, q, end] = [0, 1, 2, 3, 4];
  const [scaled, previous, current, next] = [5, 6, 7, 8];
  const { raising, lowering } = hermiteRecurrence(maxOrder);
  const body: number[] = [];
  const emit = emitter(body);
  const get = op.localGet, set = op.localSet;
  const splat = (value: number): number[] => [...op.f64Const(value), ...op.f64x2Splat];
  if (maxOrder < 1) return body;
  // end = 16 ceil(size / 2): the byte offset after the last pair.
  emit(get(size), op.i32Const(1), op.i32Add, op.i32Const(3), op.i32Shl, op.i32Const(~15), op.i32And, set(end));
  emit(op.i32Const(0), set(q));
  emit(op.block, op.loop, get(q), get(end), op.i32GeS, op.brIf(1));
  emit(get(u), get(q), op.i32Add, op.v128Load(0), set(scaled));
  emit(get(table), get(q), op.i32Add, op.v128Load(0), set(previous));
  emit(splat(Math.SQRT2), get(scaled), op.f64x2Mul, get(previous), op.f64x2Mul, set(current));
  emit(get(table), get(q), op.i32Add, get(current), op.v128Store(ROW_BYTES));
  for (let k = 1; k < maxOrder; k++) {
    emit(splat(raising[k]), get(scaled), op.f64x2Mul, get(current), op.f64x2Mul, splat(lowering[k]), get(previous), op.f64x2Mul, op.f64x2Sub, set(next));
    emit(get(table), get(q), op.i32Add, get(next), op.v128Store((k + 1) * ROW_BYTES));
    emit(get(current), set(previous), get(next), set(current));
  }
  emit(get(q), op.i32Const(16), op.i32Add, set(q), op.br(0), op.end, op.end);
  return body;
}

/** The (n1, n2) bases of one tile: n1 rows paired in vectors (n1, n1 + 1), n1 even. */
interface Tile {
  readonly firstRows: readonly number[];
  readonly columns: readonly number[];
}

/**
 * The triangle n1 + n2 <= maxOrder cut into tiles of up to TILE_PAIRS row pairs by TILE_COLUMNS
 * n2 columns, each holding every column that its first pair reaches.
 */
function tilesFor(maxOrder: number): Tile[] {
  const tiles: Tile[] = [];
  for (let n1 = 0; n1 <= maxOrder; n1 += 2 * TILE_PAIRS) {
    const firstRows = Array.from({ length: TILE_PAIRS }, (_, j) => n1 + 2 * j).filter((row) => row <= maxOrder);
    for (let n2 = 0; n2 <= maxOrder - n1; n2 += TILE_COLUMNS) {
      const columns = Array.from({ length: TILE_COLUMNS }, (_, j) => n2 + j).filter((column) => column <= maxOrder - n1);
      tiles.push({ firstRows, columns });
    }
  }
  return tiles;
}

/**
 * runMeans(runs, run): for each run t of `run` points (points t run .. t run + run - 1 of the
 * block) and each basis (n1, n2), the sum in point order of (scale phi_n1(x_i)) phi_n2(y_i) (the
 * products shapelets' writeBasis stores, the same two roundings) into sums[t basisCount + basis].
 * Each f64x2 lane holds one basis (rows n1 and n1 + 1 of the point-major copy of alongX, against
 * one n2 row of alongY, splat), so every sum is formed in order as a scalar loop would: the
 * vectors run across bases, not across points. First the copy: pointMajor[i width + k] = scale
 * alongX[k][i] (0 in the padding column of an odd order count).
 */
function runMeansBody(maxOrder: number, layout: KernelLayout): number[] {
  const [runs, run, t, xp, pp, yp, yEnd, at] = [0, 1, 2, 3, 4, 5, 6, 7];
  const scale = 8;
  const firstVector = 9;
  const orderCount = maxOrder + 1;
  const basisCount = (orderCount * (orderCount + 1)) / 2;
  const basisOf = new Map(shapeletOrders(maxOrder).map(([n1, n2], k) => [`${n1},${n2}`, k]));
  const widthBytes = 8 * layout.width;
  const body: number[] = [];
  const emit = emitter(body);
  const get = op.localGet, set = op.localSet;
  // Point-major copy of the block's runs * run points.
  emit(op.i32Const(layout.scale), op.v128Load64Splat(0), set(scale));
  emit(op.i32Const(layout.alongX), set(xp), op.i32Const(layout.pointMajor), set(pp));
  emit(op.i32Const(layout.alongX), get(runs), get(run), op.i32Mul, op.i32Const(3), op.i32Shl, op.i32Add, set(yEnd));
  emit(op.block, op.loop, get(xp), get(yEnd), op.i32GeS, op.brIf(1));
  for (let k = 0; k < orderCount; k++) {
    emit(get(pp), get(xp), op.v128Load64Zero(k * ROW_BYTES), get(scale), op.f64x2Mul, op.f64x2ExtractLane(0), op.f64Store(8 * k));
  }
  if (layout.width > orderCount) emit(get(pp), op.f64Const(0), op.f64Store(8 * orderCount));
  emit(get(xp), op.i32Const(8), op.i32Add, set(xp), get(pp), op.i32Const(widthBytes), op.i32Add, set(pp));
  emit(op.br(0), op.end, op.end);
  // The sums, run by run and tile by tile.
  const tiles = tilesFor(maxOrder);
  emit(op.i32Const(0), set(t));
  emit(op.block, op.loop, get(t), get(runs), op.i32GeS, op.brIf(1));
  // at: the run's first sum; xp, yp: its first point in pointMajor and alongY.
  emit(op.i32Const(layout.sums), get(t), op.i32Const(8 * basisCount), op.i32Mul, op.i32Add, set(at));
  for (const tile of tiles) {
    const pairs = tile.firstRows.length, columns = tile.columns.length;
    const sum = (r: number, c: number): number => firstVector + r * TILE_COLUMNS + c;
    const rowValue = (r: number): number => firstVector + TILE_PAIRS * TILE_COLUMNS + r;
    const columnValue = (c: number): number => firstVector + TILE_PAIRS * TILE_COLUMNS + TILE_PAIRS + c;
    emit(get(t), get(run), op.i32Mul, set(pp));
    emit(op.i32Const(layout.alongY), get(pp), op.i32Const(3), op.i32Shl, op.i32Add, set(yp));
    emit(get(yp), get(run), op.i32Const(3), op.i32Shl, op.i32Add, set(yEnd));
    emit(op.i32Const(layout.pointMajor), get(pp), op.i32Const(widthBytes), op.i32Mul, op.i32Add, set(pp));
    for (let r = 0; r < pairs; r++) for (let c = 0; c < columns; c++) emit(op.v128Zero, set(sum(r, c)));
    emit(op.block, op.loop, get(yp), get(yEnd), op.i32GeS, op.brIf(1));
    for (let r = 0; r < pairs; r++) emit(get(pp), op.v128Load(8 * tile.firstRows[r]), set(rowValue(r)));
    for (let c = 0; c < columns; c++) emit(get(yp), op.v128Load64Splat(tile.columns[c] * ROW_BYTES), set(columnValue(c)));
    for (let r = 0; r < pairs; r++) {
      for (let c = 0; c < columns; c++) {
        emit(get(sum(r, c)), get(rowValue(r)), get(columnValue(c)), op.f64x2Mul, op.f64x2Add, set(sum(r, c)));
      }
    }
    emit(get(pp), op.i32Const(widthBytes), op.i32Add, set(pp), get(yp), op.i32Const(8), op.i32Add, set(yp));
    emit(op.br(0), op.end, op.end);
    for (let r = 0; r < pairs; r++) {
      for (let c = 0; c < columns; c++) {
        for (let lane = 0; lane < 2; lane++) {
          const basis = basisOf.get(`${tile.firstRows[r] + lane},${tile.columns[c]}`);
          if (basis !== undefined) emit(get(at), get(sum(r, c)), op.f64x2ExtractLane(lane), op.f64Store(8 * basis));
        }
      }
    }
  }
  emit(get(t), op.i32Const(1), op.i32Add, set(t), op.br(0), op.end, op.end);
  return body;
}

/**
 * products(size): every basis image over the block's first `size` points, products[k][i] =
 * (scale alongX[n1][i]) alongY[n2][i] (writeProducts' two roundings, so the same bits), basis by
 * basis, two points per step. Not point by point across all bases: storing into every row at
 * each step ran slower than the JavaScript loop (24.0 against 22.5 ms per shapelets10
 * likelihood; the rows lie 2 KiB apart, in few cache sets). An odd size also fills the next
 * point's column (unused).
 */
function productsBody(maxOrder: number, layout: KernelLayout): number[] {
  const [size, q, end] = [0, 1, 2];
  const scale = 3;
  const body: number[] = [];
  const emit = emitter(body);
  const get = op.localGet, set = op.localSet;
  emit(op.i32Const(layout.scale), op.v128Load64Splat(0), set(scale));
  emit(get(size), op.i32Const(1), op.i32Add, op.i32Const(3), op.i32Shl, op.i32Const(~15), op.i32And, set(end));
  shapeletOrders(maxOrder).forEach(([n1, n2], k) => {
    emit(op.i32Const(0), set(q));
    emit(op.block, op.loop, get(q), get(end), op.i32GeS, op.brIf(1));
    emit(get(q), get(q), op.v128Load(layout.alongX + n1 * ROW_BYTES), get(scale), op.f64x2Mul);
    emit(get(q), op.v128Load(layout.alongY + n2 * ROW_BYTES), op.f64x2Mul, op.v128Store(layout.products + k * ROW_BYTES));
    emit(get(q), op.i32Const(16), op.i32Add, set(q), op.br(0), op.end, op.end);
  });
  return body;
}

export function shapeletModuleSpec(maxOrder: number): WasmModuleSpec {
  const i32 = WASM_TYPE.i32, v128 = WASM_TYPE.v128;
  const vectors = 1 + TILE_PAIRS * TILE_COLUMNS + TILE_PAIRS + TILE_COLUMNS;
  const layout = layoutFor(maxOrder);
  return {
    types: [[[i32, i32, i32], []], [[i32, i32], []], [[i32], []]],
    functions: [
      { type: 0, locals: [[2, i32], [4, v128]], body: ordersBody(maxOrder) },
      { type: 1, locals: [[6, i32], [vectors, v128]], body: runMeansBody(maxOrder, layout) },
      { type: 2, locals: [[2, i32], [1, v128]], body: productsBody(maxOrder, layout) },
    ],
    exports: [['orders', 0], ['runMeans', 1], ['products', 2]],
  };
}

/** Compiled modules by maximum order; null where the engine has no WebAssembly SIMD. */
const modulesByOrder = new Map<number, WebAssembly.Module | null>();

function moduleFor(maxOrder: number): WebAssembly.Module | null {
  if (!modulesByOrder.has(maxOrder)) modulesByOrder.set(maxOrder, compileWasmModule(shapeletModuleSpec(maxOrder)));
  return modulesByOrder.get(maxOrder)!;
}

/**
 * The shapelets' per-block work in WebAssembly for one maximum order: the Hermite recurrence
 * (orders) and the run sums (runMeans), on tables that live in the kernel's memory. The caller
 * writes phi_0 and the scaled positions into the views, as for its JavaScript twin.
 */
export class ShapeletKernel {
  readonly alongX: Float64Array;
  readonly alongY: Float64Array;
  readonly u: Float64Array;
  /** After runMeans: basis k of run t at sums[t * basisCount + k]. */
  readonly sums: Float64Array;
  /** The scale 1 / beta that runMeans and products apply, at scale[0]. */
  readonly scale: Float64Array;
  /** After products(size): basis k of point i at products[k * HERMITE_BLOCK + i]. */
  readonly products: Float64Array;
  /** products' row of each basis over a whole block (views made once: a copy of a full block makes no object). */
  readonly productRows: readonly Float64Array[];
  private readonly layout: KernelLayout;
  private readonly ordersOf: (table: number, u: number, size: number) => void;
  readonly runMeans: (runs: number, run: number) => void;
  readonly writeProducts: (size: number) => void;

  /** The kernel of `maxOrder`, or null where WebAssembly SIMD is not available. */
  static create(maxOrder: number): ShapeletKernel | null {
    const module = moduleFor(maxOrder);
    return module === null ? null : new ShapeletKernel(maxOrder, module);
  }

  private constructor(maxOrder: number, module: WebAssembly.Module) {
    const layout = layoutFor(maxOrder);
    const { memory } = memoryWithRegions(layout.byteLengths);
    const exports = new WebAssembly.Instance(module, { env: { memory } }).exports;
    this.ordersOf = exports.orders as (table: number, u: number, size: number) => void;
    this.runMeans = exports.runMeans as (runs: number, run: number) => void;
    this.writeProducts = exports.products as (size: number) => void;
    const view = (start: number, bytes: number): Float64Array => new Float64Array(memory.buffer, start, bytes / 8);
    const [x, y, u, , sums, scale, products] = layout.byteLengths;
    this.alongX = view(layout.alongX, x);
    this.alongY = view(layout.alongY, y);
    this.u = view(layout.u, u);
    this.sums = view(layout.sums, sums);
    this.scale = view(layout.scale, scale);
    this.products = view(layout.products, products);
    this.productRows = Array.from({ length: products / ROW_BYTES }, (_, k) => this.products.subarray(k * HERMITE_BLOCK, (k + 1) * HERMITE_BLOCK));
    this.layout = layout;
  }

  /** Orders 1..maxOrder along x (axis 0) or y (axis 1) from phi_0 and u over `size` points. */
  orders(axis: 0 | 1, size: number): void {
    this.ordersOf(axis === 0 ? this.layout.alongX : this.layout.alongY, this.layout.u, size);
  }
}
