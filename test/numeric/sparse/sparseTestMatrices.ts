// Random symmetric positive-definite sparse test matrices, as (row, column, value) entries of the
// lower triangle and as a dense ml-matrix Matrix (the reference side of every check).
import { createRequire } from 'node:module';
import type randuType from '@stdlib/random/base/randu';
import { Matrix } from 'ml-matrix';
import type { PlanePoints } from '../../../src/numeric/sparse/nestedDissection.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../../../src/numeric/sparse/symmetricCsr.js';

const require = createRequire(import.meta.url);
const randu = require('@stdlib/random/base/randu') as typeof randuType;

/** A seeded uniform stream on [0, 1) (@stdlib's Mersenne Twister): reproducible test data. */
export function uniformStream(seed: number): () => number {
  return randu.factory({ name: 'mt19937', seed });
}

/** A symmetric matrix as distinct lower-triangle entries (row >= column). */
export interface SparseCase {
  readonly name: string;
  readonly n: number;
  readonly rows: number[];
  readonly columns: number[];
  readonly values: number[];
}

/** A random permutation of 0 .. n - 1 (Fisher-Yates). */
export function shuffled(n: number, uniform: () => number): number[] {
  const p = Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(uniform() * (i + 1));
    [p[i], p[j]] = [p[j], p[i]];
  }
  return p;
}

/** Off-diagonal edges (i > j) of the 5-point k x k grid, nodes renamed by `label`. */
export function gridEdges(k: number, label: number[] = Array.from({ length: k * k }, (_, i) => i)): [number, number][] {
  const edges: [number, number][] = [];
  for (let y = 0; y < k; y++) {
    for (let x = 0; x < k; x++) {
      if (x + 1 < k) edges.push(ordered(label[y * k + x], label[y * k + x + 1]));
      if (y + 1 < k) edges.push(ordered(label[y * k + x], label[(y + 1) * k + x]));
    }
  }
  return edges;
}

function ordered(a: number, b: number): [number, number] {
  return a > b ? [a, b] : [b, a];
}

/**
 * The SPD matrix with the given off-diagonal edges: values uniform in [-1, 1] and a diagonal
 * exceeding the row's absolute sum by `margin` times a uniform draw in [1, 2), so it is
 * strictly diagonally dominant, hence positive definite (Gershgorin), with condition number
 * at most (2 max row sum + 2 margin) / margin.
 */
export function dominantCase(name: string, n: number, edges: [number, number][], uniform: () => number, margin = 1): SparseCase {
  const rows: number[] = [];
  const columns: number[] = [];
  const values: number[] = [];
  const absoluteSum = new Float64Array(n);
  const seen = new Set<number>();
  for (const [i, j] of edges) {
    if (i === j || seen.has(i * n + j)) continue;
    seen.add(i * n + j);
    const v = 2 * uniform() - 1;
    rows.push(i);
    columns.push(j);
    values.push(v);
    absoluteSum[i] += Math.abs(v);
    absoluteSum[j] += Math.abs(v);
  }
  for (let i = 0; i < n; i++) {
    rows.push(i);
    columns.push(i);
    values.push(absoluteSum[i] + margin * (1 + uniform()));
  }
  return { name, n, rows, columns, values };
}

/**
 * The 5-point Laplacian of a k x k grid with zero boundary values (4 on the diagonal, -1 for
 * each neighbour; positive definite) plus shift * I, nodes renamed by `label`: by Gershgorin
 * its eigenvalues lie in (shift, 8 + shift), so its condition number is below (8 + shift) / shift.
 */
export function laplacianCase(name: string, k: number, shift: number, label: number[]): SparseCase {
  const edges = gridEdges(k, label);
  const n = k * k;
  const rows = [...edges.map(([i]) => i), ...Array.from({ length: n }, (_, i) => i)];
  const columns = [...edges.map(([, j]) => j), ...Array.from({ length: n }, (_, i) => i)];
  const values = [...edges.map(() => -1), ...Array.from({ length: n }, () => 4 + shift)];
  return { name, n, rows, columns, values };
}

/** Edges between nodes at most `reach` apart in index, each kept with probability p. */
export function localEdges(n: number, reach: number, p: number, uniform: () => number, offset = 0): [number, number][] {
  const edges: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    for (let j = Math.max(0, i - reach); j < i; j++) if (uniform() < p) edges.push([offset + i, offset + j]);
  }
  return edges;
}

/** Edges joining each of the last `dense` nodes of n to every other node. */
export function denseTailEdges(n: number, dense: number): [number, number][] {
  const edges: [number, number][] = [];
  for (let i = n - dense; i < n; i++) for (let j = 0; j < i; j++) edges.push([i, j]);
  return edges;
}

/** The last `count` unknowns of a case whose name ends in "<count> dense" (none otherwise): its dense rows. */
export function denseTail(c: SparseCase): number[] {
  const dense = /(\d+) dense$/.exec(c.name);
  return dense ? Array.from({ length: Number(dense[1]) }, (_, t) => c.n - Number(dense[1]) + t) : [];
}

/** The named fixtures of the factorisation tests (sizes 1 .. 300). */
export function spdCases(seed = 1): SparseCase[] {
  const u = uniformStream(seed);
  const relabel = (edges: [number, number][], label: number[]): [number, number][] => edges.map(([a, b]) => ordered(label[a], label[b]));
  return [
    dominantCase('1 x 1', 1, [], u),
    dominantCase('two unconnected nodes', 2, [], u),
    laplacianCase('grid Laplacian 10 x 10 + 0.05 I', 10, 0.05, shuffled(100, u)),
    dominantCase('grid 12 x 12 shuffled', 144, gridEdges(12, shuffled(144, u)), u, 0.5),
    dominantCase('grid 17 x 17 shuffled', 289, gridEdges(17, shuffled(289, u)), u, 0.5),
    dominantCase('random local couplings', 200, relabel(localEdges(200, 12, 0.3, u), shuffled(200, u)), u),
    dominantCase('grid 15 x 15 + 5 dense', 230, [...gridEdges(15, shuffled(225, u)), ...denseTailEdges(230, 5)], u),
    dominantCase('local + 10 dense', 300, [...localEdges(290, 8, 0.5, u), ...denseTailEdges(300, 10)], u),
    dominantCase('disconnected', 150, relabel([...localEdges(60, 5, 0.5, u), ...gridEdges(8, shuffled(64, u)).map(([a, b]) => [a + 60, b + 60] as [number, number]), ...localEdges(20, 3, 0.6, u, 124)], shuffled(150, u)), u),
    dominantCase('empty rows', 40, localEdges(40, 4, 0.5, u).filter(([a, b]) => a % 7 !== 3 && b % 7 !== 3), u),
  ];
}

/** The dense symmetric matrix of a case. */
export function denseOf(c: SparseCase): Matrix {
  const a = Matrix.zeros(c.n, c.n);
  for (let t = 0; t < c.rows.length; t++) {
    a.set(c.rows[t], c.columns[t], a.get(c.rows[t], c.columns[t]) + c.values[t]);
    if (c.rows[t] !== c.columns[t]) a.set(c.columns[t], c.rows[t], a.get(c.columns[t], c.rows[t]) + c.values[t]);
  }
  return a;
}

/**
 * Feeds a case to `accumulator`, splitting each value into two halves (exact in binary) in shuffled order
 * and giving every other off-diagonal one as (column, row), so duplicates and folding are
 * exercised; returns the compressed matrix.
 */
export function accumulate(accumulator: SymmetricSparseAccumulator, c: SparseCase, uniform: () => number): SymmetricCsr {
  accumulator.reset(c.n);
  const order = shuffled(2 * c.rows.length, uniform);
  for (const s of order) {
    const t = s >> 1;
    const half = 0.5 * c.values[t];
    if ((s & 1) === 0) accumulator.add(c.rows[t], c.columns[t], half);
    else accumulator.add(c.columns[t], c.rows[t], half);
  }
  return accumulator.compress();
}

/** Plane points: x[v], y[v]. */
export interface Points {
  readonly x: number[];
  readonly y: number[];
}

/** n points uniform in the disc of `radius` about (cx, cy), by rejection from the square. */
export function discPoints(n: number, uniform: () => number, radius = 1, cx = 0, cy = 0): Points {
  const x: number[] = [];
  const y: number[] = [];
  while (x.length < n) {
    const u = 2 * uniform() - 1;
    const v = 2 * uniform() - 1;
    if (u * u + v * v >= 1) continue;
    x.push(cx + radius * u);
    y.push(cy + radius * v);
  }
  return { x, y };
}

/**
 * Edges (i > j) between the points closer than `reach`: the pattern of a wide coupling, as the
 * PSF gives a pixelated source's normal matrix.
 */
export function withinReachEdges(points: Points, reach: number): [number, number][] {
  const edges: [number, number][] = [];
  const { x, y } = points;
  for (let i = 0; i < x.length; i++) {
    for (let j = 0; j < i; j++) if ((x[i] - x[j]) ** 2 + (y[i] - y[j]) ** 2 < reach * reach) edges.push([i, j]);
  }
  return edges;
}

/** Coordinates of the first points.x.length unknowns, for NestedDissection. */
export function planePoints(points: Points | null): PlanePoints | null {
  return points === null ? null : { x: points.x, y: points.y, count: points.x.length };
}

/** Both point sets, the second's indices after the first's. */
export function joinedPoints(a: Points, b: Points): Points {
  return { x: [...a.x, ...b.x], y: [...a.y, ...b.y] };
}

/** A test case with coordinates for its first points.x.length unknowns (the rest are dense rows). */
export interface GeometricCase {
  readonly matrix: SparseCase;
  readonly points: Points;
}

/**
 * The geometric fixtures: points in a disc coupled to all within a reach (about 48 and 19
 * neighbours), with and without dense last rows, and two discs of 100 points far apart
 * (disconnected; the first cut falls between them).
 */
export function geometricCases(seed = 2): GeometricCase[] {
  const u = uniformStream(seed);
  const wide = discPoints(300, u);
  const narrow = discPoints(250, u);
  const pair = joinedPoints(discPoints(100, u, 1, -3, 0), discPoints(100, u, 1, 3, 1));
  return [
    { matrix: dominantCase('disc 300, reach 0.4 + 2 dense', 302, [...withinReachEdges(wide, 0.4), ...denseTailEdges(302, 2)], u), points: wide },
    { matrix: dominantCase('disc 250, reach 0.28', 250, withinReachEdges(narrow, 0.28), u), points: narrow },
    { matrix: dominantCase('two discs apart, reach 0.35', 200, withinReachEdges(pair, 0.35), u), points: pair },
  ];
}
