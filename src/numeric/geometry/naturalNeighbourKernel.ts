import { WASM_TYPE, compileWasmModule, element, emitter, integer, op } from '../wasm/wasmModuleBytes.js';
import { memoryWithRegions } from '../wasm/wasmMemory.js';
import type { DelaunayTriangulation } from './delaunayTriangulation.js';
import { BARYCENTRIC_TOLERANCE, scanTriangles } from './locateTriangle.js';
import { MAX_NATURAL_NEIGHBOURS } from './naturalNeighbourWeights.js';

/**
 * NaturalNeighbourWeights.weigh as WebAssembly functions (scalar): the circumcircles, the
 * visibility walk of locateTriangle, the on-vertex test, the cavity dug from a stack, the Laplace
 * weights, the triangle fallback and the -1/0 tail, each the same operations in the same order as
 * its JavaScript twin, so the same entries and counts to the bit (naturalNeighbourKernel.test.ts).
 * A walk that gives up (its step limit, which rounding alone could reach) returns to JavaScript,
 * which scans every triangle as locateTriangle does and resumes the kernel at that query.
 *
 * The memory starts with a header of i32s: the byte address of each region, then the counts
 * that outlive one function (outside, fallbacks, the cavity generation, the walk's hint).
 */
const HEADER = Object.freeze({
  qx: 0, qy: 1, vertices: 2, weights: 3, coords: 4, triangles: 5, halfedges: 6, transforms: 7,
  circles: 8, seen: 9, ring: 10, stack: 11, rowStart: 12, rowColumn: 13, rowValue: 14, slot: 15,
  outside: 16, fallbacks: 17, generation: 18, hint: 19,
});
const HEADER_FIELDS = 20;

const PER = MAX_NATURAL_NEIGHBOURS;
/** Half-edges the dig's stack holds (NaturalNeighbourWeights' stack length). */
const STACK = 4 * MAX_NATURAL_NEIGHBOURS;
/** What the walk returns at its step limit, and weighQueries' `located` when it is to walk. */
const WALK = -0x40000000;
/** The generation after which the cavity marks are cleared (NaturalNeighbourWeights' limit). */
const GENERATION_LIMIT = 0x3fffffff;

const get = op.localGet, set = op.localSet;
const { at, i32At, f64At } = element;
const i32 = WASM_TYPE.i32, f64 = WASM_TYPE.f64;
const constant = op.i32Const;
const header = (field: number): number[] => [...constant(0), ...op.i32Load(4 * field)];
const setHeader = (field: number, value: number[]): number[] => [...constant(0), ...value, ...op.i32Store(4 * field)];
const { plus, increment } = integer;
const times = (a: number[], k: number): number[] => [...a, ...constant(k), ...op.i32Mul];

// Function indices, in the order of `functions` below.
const [WRITE_CIRCLES, WALK_TO, WEIGH_ONE, DIG_RING, LAPLACE_WEIGHTS, TRIANGLE_WEIGHTS, WEIGH_QUERIES, MAPPING_ROWS] = [0, 1, 2, 3, 4, 5, 6, 7];

/** writeCircles(triangleCount): each triangle's circumcentre and squared radius (NaturalNeighbourWeights.writeCircles). */
function circlesBody(): number[] {
  const count = 0;
  const [triangles, coords, circles, t, e, a, b, c] = Array.from({ length: 8 }, (_, i) => 1 + i);
  const [ax, ay, bx, by, cx, cy, d, b2, c2, ux, uy] = Array.from({ length: 11 }, (_, i) => 9 + i);
  const body: number[] = [];
  const emit = emitter(body);
  const coordinate = (v: number, offset: number): number[] => [...at(coords, get(v), 3), ...op.f64Load(offset)];
  const vertexIndex = (offset: number): number[] => [...at(triangles, get(e), 2), ...op.i32Load(offset), ...constant(1), ...op.i32Shl];
  emit(header(HEADER.triangles), set(triangles), header(HEADER.coords), set(coords), header(HEADER.circles), set(circles));
  emit(constant(0), set(t));
  emit(op.block, op.loop, get(t), get(count), op.i32GeS, op.brIf(1));
  emit(times(get(t), 3), set(e), vertexIndex(0), set(a), vertexIndex(4), set(b), vertexIndex(8), set(c));
  emit(coordinate(a, 0), set(ax), coordinate(a, 8), set(ay));
  emit(coordinate(b, 0), get(ax), op.f64Sub, set(bx), coordinate(b, 8), get(ay), op.f64Sub, set(by));
  emit(coordinate(c, 0), get(ax), op.f64Sub, set(cx), coordinate(c, 8), get(ay), op.f64Sub, set(cy));
  emit(op.f64Const(2), get(bx), get(cy), op.f64Mul, get(by), get(cx), op.f64Mul, op.f64Sub, op.f64Mul, set(d));
  emit(get(bx), get(bx), op.f64Mul, get(by), get(by), op.f64Mul, op.f64Add, set(b2));
  emit(get(cx), get(cx), op.f64Mul, get(cy), get(cy), op.f64Mul, op.f64Add, set(c2));
  emit(get(cy), get(b2), op.f64Mul, get(by), get(c2), op.f64Mul, op.f64Sub, get(d), op.f64Div, set(ux));
  emit(get(bx), get(c2), op.f64Mul, get(cx), get(b2), op.f64Mul, op.f64Sub, get(d), op.f64Div, set(uy));
  emit(at(circles, get(e), 3), get(ax), get(ux), op.f64Add, op.f64Store(0));
  emit(at(circles, get(e), 3), get(ay), get(uy), op.f64Add, op.f64Store(8));
  emit(at(circles, get(e), 3), get(ux), get(ux), op.f64Mul, get(uy), get(uy), op.f64Mul, op.f64Add, op.f64Store(16));
  emit(increment(t), op.br(0), op.end, op.end);
  return body;
}

/** Loads of triangle t's barycentric transform (at byte `o`) into dx, dy, la, lb: locateTriangle's and triangleWeights' first lines. */
function barycentric(o: number, x: number, y: number, dx: number, dy: number, la: number, lb: number): number[] {
  const entry = (k: number): number[] => [...get(o), ...op.f64Load(8 * k)];
  return [
    ...get(x), ...entry(0), ...op.f64Sub, ...set(dx), ...get(y), ...entry(1), ...op.f64Sub, ...set(dy),
    ...entry(2), ...get(dx), ...op.f64Mul, ...entry(3), ...get(dy), ...op.f64Mul, ...op.f64Add, ...set(la),
    ...entry(4), ...get(dx), ...op.f64Mul, ...entry(5), ...get(dy), ...op.f64Mul, ...op.f64Add, ...set(lb),
  ];
}

/**
 * walk(x, y, start, maxSteps): locateTriangle's walkToTriangle, the visibility walk (Lawson 1977;
 * Devillers, Pion & Teillaud 2002); WALK when it reaches maxSteps.
 */
function walkBody(): number[] {
  const [x, y, start, maxSteps] = [0, 1, 2, 3];
  const [transforms, halfedges, t, step, o, edge, twin] = Array.from({ length: 7 }, (_, i) => 4 + i);
  const [dx, dy, la, lb, lc] = Array.from({ length: 5 }, (_, i) => 11 + i);
  const body: number[] = [];
  const emit = emitter(body);
  const inside = (l: number): number[] => [...get(l), ...op.f64Const(-BARYCENTRIC_TOLERANCE), ...op.f64Ge];
  // t when l is the least coordinate and not below the tolerance, else the edge opposite its vertex.
  const leave = (l: number, edgeOffset: number): number[] => [
    ...inside(l), ...op.if, ...get(t), ...op.return, ...op.end,
    ...times(get(t), 3), ...constant(edgeOffset), ...op.i32Add, ...set(edge),
  ];
  emit(header(HEADER.transforms), set(transforms), header(HEADER.halfedges), set(halfedges));
  emit(get(start), set(t), constant(0), set(step));
  emit(op.block, op.loop, get(step), get(maxSteps), op.i32GeS, op.brIf(1));
  emit(at(transforms, times(get(t), 6), 3), set(o), barycentric(o, x, y, dx, dy, la, lb));
  emit(op.f64Const(1), get(la), op.f64Sub, get(lb), op.f64Sub, set(lc));
  // Vertex a is opposite half-edge 3t + 1 (b -> c), b opposite 3t + 2, c opposite 3t.
  emit(get(la), get(lb), op.f64Le, get(la), get(lc), op.f64Le, op.i32And, op.if, leave(la, 1));
  emit(op.else, get(lb), get(lc), op.f64Le, op.if, leave(lb, 2), op.else, leave(lc, 0), op.end, op.end);
  emit(i32At(halfedges, get(edge)), set(twin));
  emit(get(twin), constant(0), op.i32LtS, op.if, constant(-1), get(t), op.i32Sub, op.return, op.end);
  emit(get(twin), constant(3), op.i32DivU, set(t), increment(step), op.br(0), op.end, op.end);
  emit(constant(WALK));
  return body;
}

/** triangleWeights(x, y, t, at): the barycentric weights of (x, y) in triangle t, in the first three entries. */
function triangleBody(): number[] {
  const [x, y, t, entry] = [0, 1, 2, 3];
  const [o, vertex, weight, corner] = [4, 5, 6, 7];
  const [dx, dy, la, lb] = [8, 9, 10, 11];
  const body: number[] = [];
  const emit = emitter(body);
  emit(header(HEADER.transforms), set(o), at(o, times(get(t), 6), 3), set(o));
  emit(barycentric(o, x, y, dx, dy, la, lb));
  emit(header(HEADER.vertices), set(vertex), at(vertex, get(entry), 2), set(vertex));
  emit(header(HEADER.triangles), set(corner), at(corner, times(get(t), 3), 2), set(corner));
  for (let k = 0; k < 3; k++) emit(get(vertex), get(corner), op.i32Load(4 * k), op.i32Store(4 * k));
  emit(header(HEADER.weights), set(weight), at(weight, get(entry), 3), set(weight));
  emit(get(weight), get(la), op.f64Store(0), get(weight), get(lb), op.f64Store(8));
  emit(get(weight), op.f64Const(1), get(la), op.f64Sub, get(lb), op.f64Sub, op.f64Store(16));
  return body;
}

/**
 * digRing(x, y, start): NaturalNeighbourWeights.digRing, the Bowyer-Watson cavity's boundary
 * (Bowyer 1981, Watson 1981) into the ring region; its length, or 0 for the caller's fallback.
 */
function digBody(): number[] {
  const [x, y, start] = [0, 1, 2];
  const [halfedges, triangles, circles, seen, ring, stack, generation, n, lastTo, depth, e, twin, u, base, k, from, c] =
    Array.from({ length: 17 }, (_, i) => 3 + i);
  const [dx, dy] = [20, 21];
  const body: number[] = [];
  const emit = emitter(body);
  const push = (value: number[]): number[] => [...at(stack, get(depth), 2), ...value, ...op.i32Store(0), ...increment(depth)];
  const fail = [...constant(0), ...op.return];
  emit(header(HEADER.halfedges), set(halfedges), header(HEADER.triangles), set(triangles), header(HEADER.circles), set(circles));
  emit(header(HEADER.seen), set(seen), header(HEADER.ring), set(ring), header(HEADER.stack), set(stack));
  emit(header(HEADER.generation), constant(1), op.i32Add, set(generation), setHeader(HEADER.generation, get(generation)));
  emit(at(seen, get(start), 2), get(generation), op.i32Store(0));
  emit(constant(0), set(n), constant(-1), set(lastTo), times(get(start), 3), set(e));
  emit(get(stack), get(e), constant(2), op.i32Add, op.i32Store(0));
  emit(get(stack), get(e), constant(1), op.i32Add, op.i32Store(4));
  emit(get(stack), get(e), op.i32Store(8), constant(3), set(depth));
  emit(op.block, op.loop, get(depth), constant(0), op.i32GtS, op.i32Eqz, op.brIf(1));
  emit(get(depth), constant(1), op.i32Sub, set(depth), i32At(stack, get(depth)), set(e));
  emit(i32At(halfedges, get(e)), set(twin));
  // Into the cavity triangle beyond e when its circle holds (x, y); else e is a boundary edge.
  emit(op.block, get(twin), constant(0), op.i32LtS, op.brIf(0));
  emit(get(twin), constant(3), op.i32DivU, set(u), at(circles, times(get(u), 3), 3), set(c));
  emit(get(x), get(c), op.f64Load(0), op.f64Sub, set(dx), get(y), get(c), op.f64Load(8), op.f64Sub, set(dy));
  emit(get(dx), get(dx), op.f64Mul, get(dy), get(dy), op.f64Mul, op.f64Add, get(c), op.f64Load(16), op.f64Le, op.i32Eqz, op.brIf(0));
  emit(i32At(seen, get(u)), get(generation), op.i32Eq, get(depth), constant(2), op.i32Add, constant(STACK), op.i32GtS, op.i32Or);
  emit(op.if, fail, op.end);
  emit(at(seen, get(u), 2), get(generation), op.i32Store(0));
  emit(times(get(u), 3), set(base), get(twin), get(base), op.i32Sub, set(k));
  emit(push([...get(base), ...constant(2), ...op.i32Add, ...get(twin), ...constant(1), ...op.i32Sub, ...get(k), ...op.i32Eqz, ...op.select]));
  emit(push([...get(base), ...get(twin), ...constant(1), ...op.i32Add, ...get(k), ...constant(2), ...op.i32Eq, ...op.select]));
  emit(op.br(1), op.end);
  // A boundary edge: its start joins the ring, and must be where the last one ended.
  emit(i32At(triangles, get(e)), set(from));
  emit(get(n), constant(PER), op.i32Eq, get(lastTo), constant(0), op.i32GeS, get(lastTo), get(from), op.i32Ne, op.i32And, op.i32Or);
  emit(op.if, fail, op.end);
  emit(at(ring, get(n), 2), get(from), op.i32Store(0), increment(n));
  emit(get(e), get(e), constant(3), op.i32RemU, op.i32Sub, set(base));
  emit(get(base), get(e), constant(1), op.i32Add, get(e), get(base), constant(2), op.i32Add, op.i32Eq, op.select);
  emit(set(c), i32At(triangles, get(c)), set(lastTo));
  emit(op.br(0), op.end, op.end);
  emit(get(n), constant(0), get(lastTo), get(ring), op.i32Load(0), op.i32Eq, op.select);
  return body;
}

/**
 * laplaceWeights(x, y, n, at): NaturalNeighbourWeights.laplaceWeights over the ring region, the
 * cotangent form of Sukumar et al. (2001) eq. 9; the entries written, 0 for the caller's fallback.
 */
function laplaceBody(): number[] {
  const [x, y, n, entry] = [0, 1, 2, 3];
  const [coords, ring, vertex, weight, j, next, a, b] = Array.from({ length: 8 }, (_, i) => 4 + i);
  const [ax, ay, bx, by, area2, ex, ey, inverse, sum] = Array.from({ length: 9 }, (_, i) => 12 + i);
  const body: number[] = [];
  const emit = emitter(body);
  const overRing = (inner: () => void): void => {
    emit(constant(0), set(j), op.block, op.loop, get(j), get(n), op.i32GeS, op.brIf(1));
    inner();
    emit(increment(j), op.br(0), op.end, op.end);
  };
  const weightAt = (index: number): number[] => at(weight, get(index), 3);
  const coordinateMinus = (v: number, offset: number, q: number): number[] => [...get(v), ...op.f64Load(offset), ...get(q), ...op.f64Sub];
  emit(header(HEADER.coords), set(coords), header(HEADER.ring), set(ring));
  emit(header(HEADER.vertices), set(vertex), at(vertex, get(entry), 2), set(vertex));
  emit(header(HEADER.weights), set(weight), at(weight, get(entry), 3), set(weight));
  overRing(() => emit(weightAt(j), op.f64Const(0), op.f64Store(0)));
  overRing(() => {
    emit(constant(0), get(j), constant(1), op.i32Add, get(j), constant(1), op.i32Add, get(n), op.i32Eq, op.select, set(next));
    emit(at(coords, i32At(ring, get(j)), 4), set(a), at(coords, i32At(ring, get(next)), 4), set(b));
    emit(coordinateMinus(a, 0, x), set(ax), coordinateMinus(a, 8, y), set(ay));
    emit(coordinateMinus(b, 0, x), set(bx), coordinateMinus(b, 8, y), set(by));
    // Twice the area of (q, a, b), positive as the ring turns clockwise around q.
    emit(get(ay), get(bx), op.f64Mul, get(ax), get(by), op.f64Mul, op.f64Sub, set(area2));
    emit(get(area2), op.f64Const(0), op.f64Gt, op.i32Eqz, op.if, constant(0), op.return, op.end);
    emit(get(bx), get(ax), op.f64Sub, set(ex), get(by), get(ay), op.f64Sub, set(ey));
    emit(op.f64Const(1), get(area2), op.f64Div, set(inverse));
    emit(weightAt(next), weightAt(next), op.f64Load(0));
    emit(get(ey), get(ay), op.f64Mul, get(ex), get(ax), op.f64Mul, op.f64Add, get(inverse), op.f64Neg, op.f64Mul, op.f64Add, op.f64Store(0));
    emit(weightAt(j), weightAt(j), op.f64Load(0));
    emit(get(ex), get(bx), op.f64Mul, get(ey), get(by), op.f64Mul, op.f64Add, get(inverse), op.f64Mul, op.f64Add, op.f64Store(0));
  });
  emit(op.f64Const(0), set(sum));
  overRing(() => {
    emit(at(vertex, get(j), 2), i32At(ring, get(j)), op.i32Store(0));
    emit(get(sum), weightAt(j), op.f64Load(0), op.f64Add, set(sum));
  });
  emit(get(sum), op.f64Const(0), op.f64Gt, get(sum), op.f64Const(Infinity), op.f64Lt, op.i32And, op.i32Eqz);
  emit(op.if, constant(0), op.return, op.end);
  emit(op.f64Const(1), get(sum), op.f64Div, set(inverse));
  overRing(() => emit(weightAt(j), weightAt(j), op.f64Load(0), get(inverse), op.f64Mul, op.f64Store(0)));
  emit(get(n));
  return body;
}

/** weighOne(x, y, start, at): NaturalNeighbourWeights.weighOne; the entries written. */
function weighOneBody(): number[] {
  const [x, y, start, entry] = [0, 1, 2, 3];
  const [coords, corner, v, ringCount, written, out] = Array.from({ length: 6 }, (_, i) => 4 + i);
  const body: number[] = [];
  const emit = emitter(body);
  // A query on a vertex (a traced pixel centre that is also a vertex) takes its value.
  emit(header(HEADER.coords), set(coords), header(HEADER.triangles), set(corner), at(corner, times(get(start), 3), 2), set(corner));
  for (let k = 0; k < 3; k++) {
    emit(get(corner), op.i32Load(4 * k), set(v), at(coords, get(v), 4), set(out));
    emit(get(out), op.f64Load(0), get(x), op.f64Eq, get(out), op.f64Load(8), get(y), op.f64Eq, op.i32And, op.if);
    emit(header(HEADER.vertices), get(entry), constant(2), op.i32Shl, op.i32Add, get(v), op.i32Store(0));
    emit(header(HEADER.weights), get(entry), constant(3), op.i32Shl, op.i32Add, op.f64Const(1), op.f64Store(0));
    emit(constant(1), op.return, op.end);
  }
  emit(get(x), get(y), get(start), op.call(DIG_RING), set(ringCount));
  emit(get(ringCount), constant(3), op.i32GeS, op.if);
  emit(get(x), get(y), get(ringCount), get(entry), op.call(LAPLACE_WEIGHTS), set(written));
  emit(get(written), constant(0), op.i32GtS, op.if, get(written), op.return, op.end, op.end);
  emit(setHeader(HEADER.fallbacks, plus(header(HEADER.fallbacks), constant(1))));
  emit(get(x), get(y), get(start), get(entry), op.call(TRIANGLE_WEIGHTS), constant(3));
  return body;
}

/**
 * weighQueries(from, count, triangleCount, located): NaturalNeighbourWeights.weigh's loop over
 * queries from .. count - 1, the outside count and hint kept in the header. `located` is query
 * `from`'s triangle when JavaScript has scanned for it, else WALK. Returns count when done, or
 * the query whose walk gave up (for JavaScript to scan).
 */
function queriesBody(): number[] {
  const [from, count, triangleCount, located] = [0, 1, 2, 3];
  const [qx, qy, vertex, weight, outside, hint, i, entry, found, start, written, k, end] = Array.from({ length: 13 }, (_, n) => 4 + n);
  const [x, y] = [17, 18];
  const body: number[] = [];
  const emit = emitter(body);
  const finite = (q: number): number[] => [...get(q), ...op.f64Abs, ...op.f64Const(Infinity), ...op.f64Lt];
  const keep = [...setHeader(HEADER.outside, get(outside)), ...setHeader(HEADER.hint, get(hint))];
  emit(header(HEADER.qx), set(qx), header(HEADER.qy), set(qy), header(HEADER.vertices), set(vertex), header(HEADER.weights), set(weight));
  emit(header(HEADER.outside), set(outside), header(HEADER.hint), set(hint), get(from), set(i));
  emit(op.block, op.loop, get(i), get(count), op.i32GeS, op.brIf(1));
  emit(f64At(qx, get(i)), set(x), f64At(qy, get(i)), set(y), times(get(i), PER), set(entry));
  emit(op.block);
  emit(get(i), get(from), op.i32Eq, get(located), constant(WALK), op.i32Ne, op.i32And);
  emit(op.if, get(located), set(found), op.br(1), op.end);
  // locateTriangle: the hint when it is a triangle (always, within one call), else 0.
  emit(get(hint), constant(0), get(hint), constant(0), op.i32GeS, get(hint), get(triangleCount), op.i32LtS, op.i32And, op.select, set(start));
  emit(get(triangleCount), op.i32Eqz, finite(x), finite(y), op.i32And, op.i32Eqz, op.i32Or);
  emit(op.if, constant(-1), get(start), op.i32Sub, set(found), op.br(1), op.end);
  emit(get(x), get(y), get(start), get(triangleCount), constant(1), op.i32Add, op.call(WALK_TO), set(found));
  emit(get(found), constant(WALK), op.i32Eq, op.if, keep, get(i), op.return, op.end);
  emit(op.end);
  emit(constant(0), set(written));
  emit(get(found), constant(0), op.i32LtS, op.if);
  emit(constant(-1), get(found), op.i32Sub, set(hint), increment(outside));
  emit(op.else, get(found), set(hint), get(x), get(y), get(found), get(entry), op.call(WEIGH_ONE), set(written), op.end);
  // The tail: vertex -1, weight 0.
  emit(plus(get(entry), get(written)), set(k), plus(get(entry), constant(PER)), set(end));
  emit(op.block, op.loop, get(k), get(end), op.i32GeS, op.brIf(1));
  emit(at(vertex, get(k), 2), constant(-1), op.i32Store(0), at(weight, get(k), 3), op.f64Const(0), op.f64Store(0));
  emit(increment(k), op.br(0), op.end, op.end);
  emit(increment(i), op.br(0), op.end, op.end);
  emit(keep, get(count));
  return body;
}

/**
 * mappingRows(pixels, raysPerPixel, factor): MappingMatrix.fillRows on the weights in this
 * memory, the same operations in the same order: pixel q's row merges the entries of its rays
 * q raysPerPixel .. (q + 1) raysPerPixel - 1 (each ray's up to its first vertex -1), a cell met
 * again adding weight times factor to its entry, a new one appending (cell, weight times factor)
 * through `slot` (the entry of each cell in the row being built, -1 otherwise, and -1 again
 * after the row). Writes rowStart[1 .. pixels] (rowStart[0] is 0) and returns the entries.
 */
function mappingRowsBody(): number[] {
  const [pixels, raysPerPixel, factor] = [0, 1, 2];
  const [vertex, weight, rowStart, column, value, slot, q, end, start, k, kEnd, ray, rayEnd, c, entry] = Array.from({ length: 15 }, (_, n) => 3 + n);
  const body: number[] = [];
  const emit = emitter(body);
  emit(header(HEADER.vertices), set(vertex), header(HEADER.weights), set(weight), header(HEADER.rowStart), set(rowStart));
  emit(header(HEADER.rowColumn), set(column), header(HEADER.rowValue), set(value), header(HEADER.slot), set(slot));
  emit(constant(0), set(end), constant(0), set(q));
  emit(op.block, op.loop, get(q), get(pixels), op.i32GeS, op.brIf(1));
  emit(get(end), set(start), get(q), get(raysPerPixel), op.i32Mul, set(ray), plus(get(ray), get(raysPerPixel)), set(rayEnd));
  // The pixel's rays.
  emit(op.block, op.loop, get(ray), get(rayEnd), op.i32GeS, op.brIf(1));
  emit(times(get(ray), PER), set(k), plus(get(k), constant(PER)), set(kEnd));
  // The ray's cells, up to its first -1.
  emit(op.block, op.loop, get(k), get(kEnd), op.i32GeS, op.brIf(1));
  emit(i32At(vertex, get(k)), set(c), get(c), constant(0), op.i32LtS, op.brIf(1));
  emit(i32At(slot, get(c)), set(entry));
  emit(get(entry), constant(0), op.i32GeS, op.if);
  emit(at(value, get(entry), 3), at(value, get(entry), 3), op.f64Load(0), f64At(weight, get(k)), get(factor), op.f64Mul, op.f64Add, op.f64Store(0));
  emit(op.else);
  emit(at(slot, get(c), 2), get(end), op.i32Store(0), at(column, get(end), 2), get(c), op.i32Store(0));
  emit(at(value, get(end), 3), f64At(weight, get(k)), get(factor), op.f64Mul, op.f64Store(0), increment(end));
  emit(op.end);
  emit(increment(k), op.br(0), op.end, op.end);
  emit(increment(ray), op.br(0), op.end, op.end);
  // Free the row's slots.
  emit(get(start), set(k));
  emit(op.block, op.loop, get(k), get(end), op.i32GeS, op.brIf(1));
  emit(at(slot, i32At(column, get(k)), 2), constant(-1), op.i32Store(0), increment(k), op.br(0), op.end, op.end);
  emit(at(rowStart, plus(get(q), constant(1)), 2), get(end), op.i32Store(0));
  emit(increment(q), op.br(0), op.end, op.end);
  emit(get(end));
  return body;
}

/** The compiled module, or null where the engine has no WebAssembly (NaturalNeighbourWeights then runs alone). */
export const naturalNeighbourModule = compileWasmModule({
  types: [
    [[i32], []],
    [[f64, f64, i32, i32], [i32]],
    [[f64, f64, i32], [i32]],
    [[f64, f64, i32, i32], []],
    [[i32, i32, i32, i32], [i32]],
    [[i32, i32, f64], [i32]],
  ],
  functions: [
    { type: 0, locals: [[8, i32], [11, f64]], body: circlesBody() },
    { type: 1, locals: [[7, i32], [5, f64]], body: walkBody() },
    { type: 1, locals: [[6, i32]], body: weighOneBody() },
    { type: 2, locals: [[17, i32], [2, f64]], body: digBody() },
    { type: 1, locals: [[8, i32], [9, f64]], body: laplaceBody() },
    { type: 3, locals: [[4, i32], [4, f64]], body: triangleBody() },
    { type: 4, locals: [[13, i32], [2, f64]], body: queriesBody() },
    { type: 5, locals: [[15, i32]], body: mappingRowsBody() },
  ],
  exports: [['writeCircles', WRITE_CIRCLES], ['weighQueries', WEIGH_QUERIES], ['mappingRows', MAPPING_ROWS]],
});

type WriteCircles = (triangleCount: number) => void;
type WeighQueries = (from: number, count: number, triangleCount: number, located: number) => number;
type MappingRows = (pixels: number, raysPerPixel: number, factor: number) => number;

/**
 * Natural-neighbour weights of up to `queryCapacity` queries on triangulations of up to
 * `vertexCapacity` vertices, in one WebAssembly memory sized once: its output `vertices` and
 * `weights` are views that a caller keeps as its own arrays, and the memory never grows, so no
 * view goes stale. The queries and the triangulation are copied in at each call. The same
 * memory holds the mapping matrix's rows that mappingRows merges from the weights in place
 * (MappingMatrix.fillRows' twin), so neither is copied out.
 */
export class NaturalNeighbourKernel {
  readonly queryCapacity: number;
  readonly vertexCapacity: number;
  /** At most 2 n - 5 triangles on n vertices (Euler's formula). */
  readonly triangleCapacity: number;
  /** MAX_NATURAL_NEIGHBOURS entries per query, as NaturalNeighbourWeights.weigh writes them. */
  readonly vertices: Int32Array;
  readonly weights: Float64Array;
  /** Queries weighed by their triangle in the last call (NaturalNeighbourWeights.fallbacks). */
  fallbacks = 0;
  private readonly header: Int32Array;
  private readonly qx: Float64Array;
  private readonly qy: Float64Array;
  private readonly coords: Float64Array;
  private readonly triangles: Uint32Array;
  private readonly halfedges: Int32Array;
  private readonly transforms: Float64Array;
  private readonly seen: Int32Array;
  private readonly writeCircles: WriteCircles;
  private readonly weighQueries: WeighQueries;
  private readonly mappingRowsOf: MappingRows;
  /** The rows mappingRows writes (views of this memory, valid until its next call). */
  readonly rowStart: Int32Array<ArrayBuffer>;
  readonly rowColumn: Int32Array<ArrayBuffer>;
  readonly rowValue: Float64Array<ArrayBuffer>;

  private constructor(module: WebAssembly.Module, queryCapacity: number, vertexCapacity: number) {
    const q = queryCapacity, v = vertexCapacity, t = Math.max(2 * vertexCapacity - 5, 0);
    this.queryCapacity = q;
    this.vertexCapacity = v;
    this.triangleCapacity = t;
    const { memory, starts } = memoryWithRegions([
      4 * HEADER_FIELDS, 8 * q, 8 * q, 4 * PER * q, 8 * PER * q, 16 * v, 12 * t, 12 * t, 48 * t, 24 * t, 4 * t, 4 * PER, 4 * STACK,
      4 * (q + 1), 4 * PER * q, 8 * PER * q, 4 * v,
    ]);
    const buffer = memory.buffer;
    this.header = new Int32Array(buffer, starts[0], HEADER_FIELDS);
    this.header.set(starts.slice(1), HEADER.qx);
    this.qx = new Float64Array(buffer, starts[1], q);
    this.qy = new Float64Array(buffer, starts[2], q);
    this.vertices = new Int32Array(buffer, starts[3], PER * q);
    this.weights = new Float64Array(buffer, starts[4], PER * q);
    this.coords = new Float64Array(buffer, starts[5], 2 * v);
    this.triangles = new Uint32Array(buffer, starts[6], 3 * t);
    this.halfedges = new Int32Array(buffer, starts[7], 3 * t);
    this.transforms = new Float64Array(buffer, starts[8], 6 * t);
    this.seen = new Int32Array(buffer, starts[10], t);
    this.rowStart = new Int32Array(buffer, starts[13], q + 1);
    this.rowColumn = new Int32Array(buffer, starts[14], PER * q);
    this.rowValue = new Float64Array(buffer, starts[15], PER * q);
    new Int32Array(buffer, starts[16], v).fill(-1);
    const exports = new WebAssembly.Instance(module, { env: { memory } }).exports;
    this.writeCircles = exports.writeCircles as WriteCircles;
    this.weighQueries = exports.weighQueries as WeighQueries;
    this.mappingRowsOf = exports.mappingRows as MappingRows;
  }

  /** A kernel with room for the given counts, or null where the engine has no WebAssembly. */
  static create(queryCapacity: number, vertexCapacity: number): NaturalNeighbourKernel | null {
    return naturalNeighbourModule === null ? null : new NaturalNeighbourKernel(naturalNeighbourModule, queryCapacity, vertexCapacity);
  }

  /** True when `count` queries on this triangulation fit the memory. */
  holds(triangulation: DelaunayTriangulation, count: number): boolean {
    return count <= this.queryCapacity && triangulation.vertexCount <= this.vertexCapacity && triangulation.triangleCount <= this.triangleCapacity;
  }

  /**
   * NaturalNeighbourWeights.weigh of the count queries (qx[i], qy[i]) into `vertices` and
   * `weights`, the same entries and counts (fallbacks here, walk fallbacks on the
   * triangulation); returns how many queries were outside the hull.
   */
  weigh(triangulation: DelaunayTriangulation, qx: Float64Array, qy: Float64Array, count: number): number {
    if (!this.holds(triangulation, count) || count > qx.length || count > qy.length) {
      throw new RangeError(`NaturalNeighbourKernel: ${count} queries on ${triangulation.vertexCount} vertices do not fit`);
    }
    const triangleCount = triangulation.triangleCount, header = this.header;
    this.qx.set(qx.subarray(0, count));
    this.qy.set(qy.subarray(0, count));
    this.coords.set(triangulation.coords.subarray(0, 2 * triangulation.vertexCount));
    this.triangles.set(triangulation.triangles.subarray(0, 3 * triangleCount));
    this.halfedges.set(triangulation.halfedges.subarray(0, 3 * triangleCount));
    this.transforms.set(triangulation.barycentricTransforms.subarray(0, 6 * triangleCount));
    if (header[HEADER.generation] > GENERATION_LIMIT) {
      this.seen.fill(0);
      header[HEADER.generation] = 0;
    }
    header[HEADER.outside] = 0;
    header[HEADER.fallbacks] = 0;
    header[HEADER.hint] = 0;
    this.writeCircles(triangleCount);
    let from = 0, located = WALK;
    for (;;) {
      const stopped = this.weighQueries(from, count, triangleCount, located);
      if (stopped === count) break;
      // locateTriangle's fallback after a walk that gave up.
      triangulation.walkFallbacks++;
      located = scanTriangles(triangulation, qx[stopped], qy[stopped]);
      from = stopped;
    }
    this.fallbacks = header[HEADER.fallbacks];
    return header[HEADER.outside];
  }

  /**
   * MappingMatrix's rows from this memory's weights (its `fillRows`, the same entries to the
   * bit): pixel q merges rays q raysPerPixel .. (q + 1) raysPerPixel - 1 of the last weigh,
   * each weight times `factor`, into rowStart / rowColumn / rowValue. Returns the entries.
   */
  mappingRows(pixelCount: number, raysPerPixel: number, factor: number): number {
    if (!(pixelCount >= 0 && raysPerPixel >= 1 && pixelCount * raysPerPixel <= this.queryCapacity)) {
      throw new RangeError(`NaturalNeighbourKernel: ${pixelCount} pixels of ${raysPerPixel} rays do not fit ${this.queryCapacity} queries`);
    }
    this.rowStart[0] = 0;
    return this.mappingRowsOf(pixelCount, raysPerPixel, factor);
  }
}
