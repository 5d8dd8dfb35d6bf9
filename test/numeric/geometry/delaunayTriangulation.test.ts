// Tests of src/numeric/geometry/delaunayTriangulation.ts against scipy.spatial.Delaunay (Qhull).
import { describe, expect, it } from 'vitest';
import {
  DelaunayTriangulation,
  TriangulationStatus,
  triangulationStatusNames,
} from '../../../src/numeric/geometry/index.js';
import { delaunayCases, sortedTriples, triangulate } from './delaunayFixture.js';

describe('DelaunayTriangulation', () => {
  for (const c of delaunayCases) {
    it(`${c.name}: the same triangles as scipy.spatial.Delaunay (${c.x.length} points in general position)`, () => {
      const triangulation = triangulate(c);
      expect(triangulation.status).toBe(TriangulationStatus.ok);
      expect(triangulation.triangleCount).toBe(c.triangles.length);
      expect(sortedTriples(triangulation)).toEqual(c.triangles);
    });

    it(`${c.name}: clockwise triangles (y up), the hull of scipy.spatial.ConvexHull, Euler's count`, () => {
      const triangulation = triangulate(c);
      // delaunator documents counter-clockwise triangles with y pointing down (robust-predicates'
      // orient2d convention): with y up, (b - a) x (c - a) < 0 in every triangle.
      const { coords, triangles } = triangulation;
      for (let t = 0; t < triangulation.triangleCount; t++) {
        const [a, b, d] = [2 * triangles[3 * t], 2 * triangles[3 * t + 1], 2 * triangles[3 * t + 2]];
        const first = (coords[b] - coords[a]) * (coords[d + 1] - coords[a + 1]);
        const second = (coords[b + 1] - coords[a + 1]) * (coords[d] - coords[a]);
        expect(first - second).toBeLessThan(0);
        // The same area from another corner: each rounding of the two-term determinant is within
        // eps/2 of |first| + |second|, so both versions agree to a few eps of that sum.
        const area = (second - first) / 2;
        expect(Math.abs(triangulation.triangleAreas[t] - area)).toBeLessThanOrEqual(4 * 2 ** -52 * (Math.abs(first) + Math.abs(second)));
      }
      expect(Array.from(triangulation.hull).sort((a, b) => a - b)).toEqual(c.hullVertices);
      // Euler's formula for a triangulated point set (common practice): 2n - 2 - h triangles.
      expect(triangulation.triangleCount).toBe(2 * c.x.length - 2 - c.hullVertices.length);
    });
  }

  it('rebuilds a triangulation of the same point count in place (delaunator update) and gets scipy\'s answer', () => {
    const [first, second] = delaunayCases.filter((c) => c.x.length === 600);
    expect(second).toBeDefined();
    const triangulation = triangulate(first);
    const { coords, barycentricTransforms } = triangulation;
    const triangleBuffer = triangulation.triangles.buffer;
    triangulate(second, triangulation);
    expect(sortedTriples(triangulation)).toEqual(second.triangles);
    expect(triangulation.coords).toBe(coords);
    expect(triangulation.barycentricTransforms).toBe(barycentricTransforms);
    expect(triangulation.triangles.buffer).toBe(triangleBuffer);
    triangulate(first, triangulation);
    expect(sortedTriples(triangulation)).toEqual(first.triangles);
  });

  it('follows a change of point count, both ways', () => {
    const triangulation = new DelaunayTriangulation();
    for (const c of [...delaunayCases, delaunayCases[0]]) {
      triangulate(c, triangulation);
      expect(triangulation.vertexCount).toBe(c.x.length);
      expect(sortedTriples(triangulation)).toEqual(c.triangles);
    }
  });

  it('triangulates an exact square grid (four points on every circle, collinear hull points)', () => {
    // Not unique, so no scipy comparison: any Delaunay triangulation of an m x m grid of
    // spacing s cuts each of its (m - 1)^2 squares into two triangles of area s^2 / 2.
    const [m, s] = [30, 0.03];
    const x = new Float64Array(m * m);
    const y = new Float64Array(m * m);
    for (let k = 0; k < m * m; k++) {
      x[k] = 0.7 + (k % m) * s;
      y[k] = -0.3 + Math.floor(k / m) * s;
    }
    const triangulation = new DelaunayTriangulation();
    expect(triangulation.rebuild(x, y)).toBe(TriangulationStatus.ok);
    expect(triangulation.triangleCount).toBe(2 * (m - 1) ** 2);
    // Coordinates carry rounding of about eps * 1.6, so areas within 1e-15 of 4.5e-4.
    for (let t = 0; t < triangulation.triangleCount; t++) expect(Math.abs(triangulation.triangleAreas[t] - (s * s) / 2)).toBeLessThan(1e-15);
  });

  it('reads only the first `count` vertices and refuses a count beyond the arrays', () => {
    const c = delaunayCases[0];
    const triangulation = new DelaunayTriangulation();
    const x = Float64Array.from([...c.x, Number.NaN]);
    const y = Float64Array.from([...c.y, Number.NaN]);
    expect(triangulation.rebuild(x, y, c.x.length)).toBe(TriangulationStatus.ok);
    expect(sortedTriples(triangulation)).toEqual(c.triangles);
    expect(() => triangulation.rebuild(x, y, x.length + 1)).toThrow(RangeError);
  });
});

describe('DelaunayTriangulation on degenerate input: a status, no triangles, no exception', () => {
  const uniform = delaunayCases[0];
  const cases: { name: string; x: number[]; y: number[]; status: number }[] = [
    { name: 'no points', x: [], y: [], status: TriangulationStatus.tooFewPoints },
    { name: 'one point', x: [0.5], y: [0.5], status: TriangulationStatus.tooFewPoints },
    { name: 'two points', x: [0, 1], y: [0, 1], status: TriangulationStatus.tooFewPoints },
    // y = 2x + 1 at whole x: every point exactly on the line.
    { name: 'ten collinear points', x: [...Array(10).keys()], y: [...Array(10).keys()].map((k) => 2 * k + 1), status: TriangulationStatus.collinear },
    { name: 'three collinear points', x: [0, 0.25, 1], y: [0, 0.5, 2], status: TriangulationStatus.collinear },
    { name: 'five coincident points', x: Array(5).fill(0.1), y: Array(5).fill(-0.2), status: TriangulationStatus.collinear },
    { name: 'a duplicated vertex', x: [...uniform.x, uniform.x[17]], y: [...uniform.y, uniform.y[17]], status: TriangulationStatus.duplicatePoints },
    { name: 'a triangle and a copy of a corner', x: [0, 1, 0, 1], y: [0, 0, 1, 0], status: TriangulationStatus.duplicatePoints },
    { name: 'a NaN coordinate', x: [0, 1, 0, Number.NaN], y: [0, 0, 1, 1], status: TriangulationStatus.nonFinitePoint },
    { name: 'an infinite coordinate', x: [0, 1, 0, 1], y: [0, 0, 1, Number.POSITIVE_INFINITY], status: TriangulationStatus.nonFinitePoint },
  ];
  for (const d of cases) {
    it(`${d.name}: ${triangulationStatusNames[d.status]}`, () => {
      const triangulation = new DelaunayTriangulation();
      expect(triangulation.rebuild(Float64Array.from(d.x), Float64Array.from(d.y))).toBe(d.status);
      expect(triangulation.status).toBe(d.status);
      expect(triangulation.ok).toBe(false);
      expect(triangulation.triangleCount).toBe(0);
      expect(triangulation.triangles.length).toBe(0);
      expect(triangulation.hull.length).toBe(0);
      expect(triangulation.vertexCount).toBe(d.x.length);
    });
  }

  it('recovers on the next rebuild of the same size after a failure', () => {
    const triangulation = new DelaunayTriangulation();
    const x = Float64Array.from(uniform.x);
    const y = Float64Array.from(uniform.y);
    x[3] = x[4];
    y[3] = y[4];
    expect(triangulation.rebuild(x, y)).toBe(TriangulationStatus.duplicatePoints);
    x[3] = uniform.x[3];
    y[3] = uniform.y[3];
    expect(triangulation.rebuild(x, y)).toBe(TriangulationStatus.ok);
    expect(sortedTriples(triangulation)).toEqual(uniform.triangles);
  });

  it('names every status code', () => {
    for (const [name, code] of Object.entries(TriangulationStatus)) expect(triangulationStatusNames[code]).toBe(name);
  });
});
