import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DelaunayTriangulation } from '../../../src/numeric/geometry/delaunayTriangulation.js';
import { MAX_NATURAL_NEIGHBOURS, NaturalNeighbourWeights } from '../../../src/numeric/geometry/naturalNeighbourWeights.js';

// Laplace natural-neighbour weights against scipy's Voronoi diagram (fixtures/
// make_natural_neighbours.py: the ridge lengths and distances of each query's neighbours), and
// against the properties Sukumar et al. (2001) prove: non-negative, partition of unity, linear
// precision, and continuity in the query and in the vertices.
interface Fixture { cases: { name: string; points: number[][]; queries: { q: number[]; neighbours: number[]; weights: number[] }[] }[] }
const fixture = JSON.parse(readFileSync(new URL('./fixtures/natural_neighbours.json', import.meta.url), 'utf8')) as Fixture;
const per = MAX_NATURAL_NEIGHBOURS;

function triangulate(points: number[][]): DelaunayTriangulation {
  const t = new DelaunayTriangulation();
  t.rebuild(Float64Array.from(points, (p) => p[0]), Float64Array.from(points, (p) => p[1]));
  return t;
}

function weighAll(t: DelaunayTriangulation, qx: number[], qy: number[]): { vertices: Int32Array; weights: Float64Array; outside: number; fallbacks: number } {
  const n = qx.length;
  const vertices = new Int32Array(per * n), weights = new Float64Array(per * n);
  const w = new NaturalNeighbourWeights();
  const outside = w.weigh(t, Float64Array.from(qx), Float64Array.from(qy), n, vertices, weights);
  return { vertices, weights, outside, fallbacks: w.fallbacks };
}

describe('Laplace natural-neighbour weights', () => {
  for (const c of fixture.cases) {
    it(`equal scipy's Voronoi ridges over distances (${c.name}, ${c.queries.length} queries, to 1e-10)`, () => {
      const t = triangulate(c.points);
      const { vertices, weights, outside, fallbacks } = weighAll(t, c.queries.map((q) => q.q[0]), c.queries.map((q) => q.q[1]));
      expect(outside).toBe(0);
      expect(fallbacks).toBe(0);
      c.queries.forEach((query, i) => {
        const got = new Map<number, number>();
        for (let k = per * i; k < per * (i + 1); k++) if (vertices[k] >= 0) got.set(vertices[k], weights[k]);
        expect([...got.keys()].sort((a, b) => a - b)).toEqual(query.neighbours);
        query.neighbours.forEach((v, k) => expect(Math.abs(got.get(v)! - query.weights[k])).toBeLessThan(1e-10));
      });
    });
  }

  it('are non-negative, sum to 1 and reproduce linear functions (Sukumar et al. 2001)', () => {
    const points = fixture.cases[0].points;
    const t = triangulate(points);
    const qx: number[] = [], qy: number[] = [];
    for (let k = 0; k < 400; k++) { qx.push(-0.9 + 1.8 * ((k * 0.6180339887) % 1)); qy.push(-0.9 + 1.8 * ((k * 0.7548776662) % 1)); }
    const { vertices, weights } = weighAll(t, qx, qy);
    const f = (x: number, y: number): number => 0.3 + 2 * x - 1.5 * y;
    for (let i = 0; i < qx.length; i++) {
      if (vertices[per * i] < 0) continue;
      let sum = 0, value = 0;
      for (let k = per * i; k < per * (i + 1); k++) {
        if (vertices[k] < 0) continue;
        expect(weights[k]).toBeGreaterThanOrEqual(0);
        sum += weights[k];
        value += weights[k] * f(points[vertices[k]][0], points[vertices[k]][1]);
      }
      expect(sum).toBeCloseTo(1, 12);
      expect(value).toBeCloseTo(f(qx[i], qy[i]), 11);
    }
  });

  it('take a vertex\'s value on it and stay a partition of unity on an edge (Sukumar et al. 2001)', () => {
    // Interpolation is exact at the vertices (the Kronecker-delta property); a query on a
    // shared edge still sums to 1 and reproduces linear functions.
    const points = fixture.cases[0].points;
    const t = triangulate(points);
    const [a, b] = [t.triangles[0], t.triangles[1]];
    const qx = [points[a][0], points[b][0], 0.5 * (points[a][0] + points[b][0])];
    const qy = [points[a][1], points[b][1], 0.5 * (points[a][1] + points[b][1])];
    const { vertices, weights, outside } = weighAll(t, qx, qy);
    expect(outside).toBe(0);
    expect([vertices[0], weights[0], vertices[1]]).toEqual([a, 1, -1]);
    expect([vertices[per], weights[per], vertices[per + 1]]).toEqual([b, 1, -1]);
    const f = (x: number, y: number): number => 0.3 + 2 * x - 1.5 * y;
    let sum = 0, value = 0;
    for (let k = 2 * per; k < 3 * per; k++) {
      if (vertices[k] < 0) continue;
      sum += weights[k];
      value += weights[k] * f(points[vertices[k]][0], points[vertices[k]][1]);
    }
    expect(sum).toBeCloseTo(1, 12);
    expect(value).toBeCloseTo(f(qx[2], qy[2]), 11);
  });

  it('change continuously as the vertices move through edge flips (unlike the holding triangle)', () => {
    // Four vertices of a square, the fourth moved across the circle through the other three:
    // the Delaunay diagonal flips there, the barycentric weights jump, these do not.
    const qx = [0.45], qy = [0.4];
    let previous: Map<number, number> | undefined;
    let worst = 0;
    for (let k = -50; k <= 50; k++) {
      const d = 1e-4 * k;
      const t = triangulate([[0, 0], [1, 0], [0, 1], [1 + d, 1 + d], [0.5, -1], [-1, 0.5], [2, 0.5], [0.5, 2]]);
      const { vertices, weights } = weighAll(t, qx, qy);
      const now = new Map<number, number>();
      for (let j = 0; j < per; j++) if (vertices[j] >= 0) now.set(vertices[j], weights[j]);
      if (previous !== undefined) {
        for (const v of new Set([...now.keys(), ...previous.keys()])) worst = Math.max(worst, Math.abs((now.get(v) ?? 0) - (previous.get(v) ?? 0)));
      }
      previous = now;
    }
    // A step of 1e-4 in a vertex moves no weight by more than a few times 1e-4.
    expect(worst).toBeLessThan(1e-3);
  });
});
