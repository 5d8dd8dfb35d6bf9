import { describe, expect, it } from 'vitest';
import { DelaunayTriangulation } from '../../../src/numeric/geometry/delaunayTriangulation.js';
import { NaturalNeighbourKernel, naturalNeighbourModule } from '../../../src/numeric/geometry/naturalNeighbourKernel.js';
import { MAX_NATURAL_NEIGHBOURS, NaturalNeighbourWeights } from '../../../src/numeric/geometry/naturalNeighbourWeights.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';

// The WebAssembly kernel against its JavaScript twin, NaturalNeighbourWeights (itself tested
// against scipy's Voronoi diagram in naturalNeighbourWeights.test.ts): every entry's vertex and
// the bit pattern of every weight, the outside count, the triangle fallbacks and the walks that
// gave up. The degenerate fixtures check that each path of the twin is taken at least once, so
// that agreement there is not vacuous.
const per = MAX_NATURAL_NEIGHBOURS;

interface Weighed { vertices: Int32Array; weights: Float64Array; outside: number; fallbacks: number; walkFallbacks: number }

/** The paths the twin took, seen through its own methods (private in TypeScript, plain at run time). */
interface Paths { brokenRings: number; flatRings: number }

function triangulate(x: ArrayLike<number>, y: ArrayLike<number>): DelaunayTriangulation {
  const t = new DelaunayTriangulation();
  t.rebuild(Float64Array.from(x), Float64Array.from(y));
  expect(t.ok).toBe(true);
  return t;
}

/** Watches the twin's dig and Laplace weights: a ring the dig refuses, and one whose weights fail. */
function watchPaths(twin: NaturalNeighbourWeights): Paths {
  const paths = { brokenRings: 0, flatRings: 0 };
  const inner = twin as unknown as Record<'digRing' | 'laplaceWeights', (...args: unknown[]) => number>;
  const dig = inner.digRing, laplace = inner.laplaceWeights;
  inner.digRing = function (this: unknown, ...args: unknown[]): number {
    const n = dig.apply(this, args);
    if (n === 0) paths.brokenRings++;
    return n;
  };
  inner.laplaceWeights = function (this: unknown, ...args: unknown[]): number {
    const written = laplace.apply(this, args);
    if (written === 0) paths.flatRings++;
    return written;
  };
  return paths;
}

function twinWeigh(twin: NaturalNeighbourWeights, t: DelaunayTriangulation, qx: Float64Array, qy: Float64Array): Weighed {
  const n = qx.length;
  const vertices = new Int32Array(per * n).fill(7), weights = new Float64Array(per * n).fill(0.5);
  const before = t.walkFallbacks;
  const outside = twin.weigh(t, qx, qy, n, vertices, weights);
  return { vertices, weights, outside, fallbacks: twin.fallbacks, walkFallbacks: t.walkFallbacks - before };
}

function kernelWeigh(kernel: NaturalNeighbourKernel, t: DelaunayTriangulation, qx: Float64Array, qy: Float64Array): Weighed {
  const n = qx.length;
  // Stale entries of an earlier call must all be overwritten.
  kernel.vertices.fill(7);
  kernel.weights.fill(0.5);
  const before = t.walkFallbacks;
  const outside = kernel.weigh(t, qx, qy, n);
  return {
    vertices: kernel.vertices.slice(0, per * n), weights: kernel.weights.slice(0, per * n),
    outside, fallbacks: kernel.fallbacks, walkFallbacks: t.walkFallbacks - before,
  };
}

/** The first entry whose vertex or weight bits differ, or -1. */
function firstDifference(a: Weighed, b: Weighed): number {
  const wa = new BigUint64Array(a.weights.buffer, a.weights.byteOffset, a.weights.length);
  const wb = new BigUint64Array(b.weights.buffer, b.weights.byteOffset, b.weights.length);
  if (wa.length !== wb.length) return 0;
  for (let k = 0; k < wa.length; k++) if (wa[k] !== wb[k] || a.vertices[k] !== b.vertices[k]) return k;
  return -1;
}

function expectSame(kernel: Weighed, twin: Weighed): void {
  const k = firstDifference(kernel, twin);
  const shown = k < 0 ? '' : `entry ${k} (query ${Math.floor(k / per)}): kernel ${kernel.vertices[k]} ${kernel.weights[k]}, twin ${twin.vertices[k]} ${twin.weights[k]}`;
  expect(shown).toBe('');
  expect([kernel.outside, kernel.fallbacks, kernel.walkFallbacks]).toEqual([twin.outside, twin.fallbacks, twin.walkFallbacks]);
}

/** Queries (as arrays) of one entry of weight 1: on a vertex. */
function onVertexCount(w: Weighed): number {
  let count = 0;
  for (let at = 0; at < w.vertices.length; at += per) if (w.vertices[at] >= 0 && w.weights[at] === 1 && w.vertices[at + 1] === -1) count++;
  return count;
}

/** The double `ulps` units in the last place from a positive x (its bit pattern moved by ulps). */
function beside(x: number, ulps: number): number {
  const bits = new BigInt64Array(Float64Array.of(x).buffer);
  bits[0] += BigInt(ulps);
  return new Float64Array(bits.buffer)[0];
}

function uniformPoints(stream: SeededStream, n: number, low: number, high: number): { x: Float64Array; y: Float64Array } {
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    x[k] = low + (high - low) * stream.uniform();
    y[k] = low + (high - low) * stream.uniform();
  }
  return { x, y };
}

describe.runIf(naturalNeighbourModule !== null)('NaturalNeighbourKernel against NaturalNeighbourWeights, bit for bit', () => {
  it('on random point sets, many queries in and around the hull, one kernel over several calls', () => {
    // Besides uniform queries, queries a few units in the last place beside each vertex of the
    // first set: the vertex lies on its triangles' circles, so there the in-circle tests turn on
    // the last bits of the circumcentres.
    const stream = SeededStream.fromSeed(20240611);
    const kernel = NaturalNeighbourKernel.create(40000, 800)!;
    const twin = new NaturalNeighbourWeights();
    // A uniform square, a smaller set (the kernel's memory half used) and a Gaussian cloud (long walks).
    const gaussian = { x: new Float64Array(800), y: new Float64Array(800) };
    for (let k = 0; k < 800; k++) {
      gaussian.x[k] = 0.3 * stream.normal();
      gaussian.y[k] = 0.2 * stream.normal();
    }
    const sets = [uniformPoints(stream, 600, 0, 1), uniformPoints(stream, 150, 0, 1), gaussian];
    for (const [s, points] of sets.entries()) {
      const t = triangulate(points.x, points.y);
      let queries = uniformPoints(stream, s === 1 ? 5000 : 30000, -0.15, 1.15);
      if (s === 2) for (let k = 0; k < queries.x.length; k++) { queries.x[k] -= 0.5; queries.y[k] -= 0.5; }
      if (s === 0) {
        const x = Array.from(queries.x), y = Array.from(queries.y);
        for (let v = 0; v < points.x.length; v++) {
          for (const ulps of [1, 3]) {
            for (const [a, b] of [[1, 0], [-1, 0], [0, 1], [0, -1], [1, 1], [-1, -1]]) { x.push(beside(points.x[v], a * ulps)); y.push(beside(points.y[v], b * ulps)); }
          }
        }
        queries = { x: Float64Array.from(x), y: Float64Array.from(y) };
      }
      const fromTwin = twinWeigh(twin, t, queries.x, queries.y);
      expectSame(kernelWeigh(kernel, t, queries.x, queries.y), fromTwin);
      expect(fromTwin.outside).toBeGreaterThan(0);
      expect(fromTwin.outside).toBeLessThan(queries.x.length);
    }
  });

  it('on a regular grid (cocircular quadruples): on vertices, on edges, beside vertices and outside', () => {
    // 12 x 12 vertices 0.25 apart; queries on the 1/16 lattice over a larger square (vertices,
    // edge midpoints, cell centres, outside), and a few units in the last place beside each
    // inner vertex and cell centre, where the rounded circles of the cocircular triangles leave
    // cavities that do not close.
    const vx: number[] = [], vy: number[] = [];
    for (let j = 0; j < 12; j++) for (let i = 0; i < 12; i++) { vx.push(0.25 * i); vy.push(0.25 * j); }
    const qx: number[] = [], qy: number[] = [];
    for (let j = -2; j < 48; j++) for (let i = -2; i < 48; i++) { qx.push(0.0625 * i); qy.push(0.0625 * j); }
    for (let j = 1; j < 11; j++) {
      for (let i = 1; i < 11; i++) {
        for (const ulps of [1, 4, 64]) {
          for (const [a, b] of [[1, 0], [-1, 0], [0, 1], [0, -1], [1, 1], [-1, 1], [1, -1], [-1, -1]]) {
            for (const centre of [0, 0.5]) {
              qx.push(beside(0.25 * (i + centre), a * ulps));
              qy.push(beside(0.25 * (j + centre), b * ulps));
            }
          }
        }
      }
    }
    const t = triangulate(vx, vy);
    const twin = new NaturalNeighbourWeights();
    const paths = watchPaths(twin);
    const x = Float64Array.from(qx), y = Float64Array.from(qy);
    const fromTwin = twinWeigh(twin, t, x, y);
    expectSame(kernelWeigh(NaturalNeighbourKernel.create(qx.length, vx.length)!, t, x, y), fromTwin);
    expect(onVertexCount(fromTwin)).toBeGreaterThan(0);
    expect(fromTwin.outside).toBeGreaterThan(0);
    expect(paths.brokenRings).toBeGreaterThan(0);
    expect(paths.flatRings).toBeGreaterThan(0);
    expect(fromTwin.fallbacks).toBe(paths.brokenRings + paths.flatRings);
  });

  it('on rings of cocircular vertices around the query: 24 natural neighbours fill every entry, 25 fall back', () => {
    // The centre lies inside every inner triangle's circle (Bowyer 1981, Watson 1981), so all
    // of the ring are its natural neighbours; an outer ring of 7 keeps the inner one inside.
    const results: number[] = [];
    for (const ring of [23, 24, 25, 40]) {
      const vx: number[] = [], vy: number[] = [];
      for (let k = 0; k < ring; k++) { vx.push(Math.cos((2 * Math.PI * k) / ring)); vy.push(Math.sin((2 * Math.PI * k) / ring)); }
      for (let k = 0; k < 7; k++) { vx.push(3 * Math.cos((2 * Math.PI * (k + 0.3)) / 7)); vy.push(3 * Math.sin((2 * Math.PI * (k + 0.3)) / 7)); }
      const t = triangulate(vx, vy);
      const x = Float64Array.of(0, 1.8, 5), y = Float64Array.of(0, 0.1, 0);
      const fromTwin = twinWeigh(new NaturalNeighbourWeights(), t, x, y);
      expectSame(kernelWeigh(NaturalNeighbourKernel.create(3, vx.length)!, t, x, y), fromTwin);
      expect(fromTwin.outside).toBe(1);
      results.push(fromTwin.fallbacks, Array.from(fromTwin.vertices.subarray(0, per)).filter((v) => v >= 0).length);
    }
    expect(results).toEqual([0, 23, 0, 24, 1, 3, 1, 3]);
  });

  it('when walks give up: the kernel hands those queries to the scan in JavaScript and resumes', () => {
    // A Delaunay walk does not cycle in exact arithmetic (Edelsbrunner 1990), so two neighbouring
    // triangles' barycentric transforms are overwritten to send the walk from each to the other
    // (what rounding could do): walks that reach them run to the step limit and scan.
    const stream = SeededStream.fromSeed(7);
    const points = uniformPoints(stream, 300, 0, 1);
    const t = triangulate(points.x, points.y);
    const { halfedges, barycentricTransforms: m } = t;
    let a = 0;
    while (halfedges[3 * a + 1] < 0) a++;
    const twinEdge = halfedges[3 * a + 1];
    const b = Math.floor(twinEdge / 3);
    // Exit across half-edge 3t + r: the coordinate of the vertex opposite it far below zero.
    const sendAcross = (tri: number, r: number): void => {
      m.set([1e6, 0, 0, 0, 0, 0], 6 * tri);
      if (r === 1) m[6 * tri + 2] = 1;
      if (r === 2) m[6 * tri + 4] = 1;
      if (r === 0) m[6 * tri + 2] = -1;
    };
    sendAcross(a, 1);
    sendAcross(b, twinEdge - 3 * b);
    const corners = (tri: number): number[] => Array.from(t.triangles.subarray(3 * tri, 3 * tri + 3));
    const qx: number[] = [], qy: number[] = [];
    for (const tri of [a, b]) {
      const [p, q, r] = corners(tri);
      qx.push((points.x[p] + points.x[q] + points.x[r]) / 3);
      qy.push((points.y[p] + points.y[q] + points.y[r]) / 3);
    }
    const more = uniformPoints(stream, 2000, 0, 1);
    qx.push(...more.x);
    qy.push(...more.y);
    const x = Float64Array.from(qx), y = Float64Array.from(qy);
    const fromTwin = twinWeigh(new NaturalNeighbourWeights(), t, x, y);
    expectSame(kernelWeigh(NaturalNeighbourKernel.create(qx.length, 300)!, t, x, y), fromTwin);
    expect(fromTwin.walkFallbacks).toBeGreaterThan(0);
    expect(fromTwin.walkFallbacks).toBeLessThan(qx.length);
  });

  it('with no triangles and with points that are not finite: every such query outside', () => {
    const t = new DelaunayTriangulation();
    t.rebuild(Float64Array.of(0, 1, 2), Float64Array.of(0, 1, 2));
    expect(t.triangleCount).toBe(0);
    const x = Float64Array.of(0.5, NaN), y = Float64Array.of(0.5, 0);
    expectSame(kernelWeigh(NaturalNeighbourKernel.create(2, 3)!, t, x, y), twinWeigh(new NaturalNeighbourWeights(), t, x, y));
    const square = triangulate([0, 1, 0, 1], [0, 0, 1, 1]);
    const far = Float64Array.of(0.5, Infinity, NaN, 0.25), near = Float64Array.of(0.5, 0.5, 0.5, 0.75);
    const fromTwin = twinWeigh(new NaturalNeighbourWeights(), square, far, near);
    expectSame(kernelWeigh(NaturalNeighbourKernel.create(4, 4)!, square, far, near), fromTwin);
    expect(fromTwin.outside).toBe(2);
  });

  it('refuses counts beyond its memory, which never grows', () => {
    const stream = SeededStream.fromSeed(3);
    const points = uniformPoints(stream, 50, 0, 1);
    const t = triangulate(points.x, points.y);
    const kernel = NaturalNeighbourKernel.create(10, 40)!;
    const { vertices, weights } = kernel;
    expect(kernel.holds(t, 10)).toBe(false);
    expect(() => kernel.weigh(t, points.x, points.y, 10)).toThrow(RangeError);
    expect(NaturalNeighbourKernel.create(11, 50)!.holds(t, 11)).toBe(true);
    expect([kernel.vertices, kernel.weights]).toEqual([vertices, weights]);
  });
});
