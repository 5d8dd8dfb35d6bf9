// Tests of src/numeric/geometry/locateTriangle.ts against scipy.spatial.Delaunay.find_simplex.
import { describe, expect, it } from 'vitest';
import { DelaunayTriangulation, locateTriangle, scanTriangles } from '../../../src/numeric/geometry/index.js';
import { delaunayCases, triangulate, type DelaunayCase } from './delaunayFixture.js';

/** Sorted vertices of triangle t. */
function cornersOf(triangulation: DelaunayTriangulation, t: number): number[] {
  return Array.from(triangulation.triangles.subarray(3 * t, 3 * t + 3)).sort((a, b) => a - b);
}

/** Checks a location answer for query q of case c against scipy's find_simplex. */
function expectScipyAnswer(triangulation: DelaunayTriangulation, c: DelaunayCase, q: number, found: number): void {
  const expected = c.queryVertices[q];
  if (expected === null) {
    expect(found, `query ${q} is outside in scipy`).toBeLessThan(0);
    expect(-1 - found).toBeLessThan(triangulation.triangleCount);
  } else {
    expect(found, `query ${q} is inside in scipy`).toBeGreaterThanOrEqual(0);
    expect(cornersOf(triangulation, found)).toEqual([...expected].sort((a, b) => a - b));
  }
}

describe('locateTriangle', () => {
  for (const c of delaunayCases) {
    const inside = c.queryVertices.filter((v) => v !== null).length;
    it(`${c.name}: the triangle of find_simplex, or outside, for ${c.queryX.length} queries (${inside} inside), 1e-9 or more from any edge`, () => {
      const triangulation = triangulate(c);
      let hint = 0;
      for (let q = 0; q < c.queryX.length; q++) {
        const found = locateTriangle(triangulation, c.queryX[q], c.queryY[q], hint);
        expectScipyAnswer(triangulation, c, q, found);
        hint = found >= 0 ? found : -1 - found;
      }
      expect(triangulation.walkFallbacks).toBe(0);
    });

    it(`${c.name}: the same answer from every start triangle`, () => {
      const triangulation = triangulate(c);
      const differing: string[] = [];
      for (let q = 0; q < c.queryX.length; q += 25) {
        const fromZero = locateTriangle(triangulation, c.queryX[q], c.queryY[q], 0);
        expectScipyAnswer(triangulation, c, q, fromZero);
        for (let start = 1; start < triangulation.triangleCount; start++) {
          const found = locateTriangle(triangulation, c.queryX[q], c.queryY[q], start);
          if ((found < 0) !== (fromZero < 0) || (found >= 0 && found !== fromZero)) differing.push(`query ${q} from ${start}: ${found}`);
        }
      }
      expect(differing).toEqual([]);
      expect(triangulation.walkFallbacks).toBe(0);
    });

    it(`${c.name}: the scan (the walk's fallback) gives find_simplex's answer too`, () => {
      const triangulation = triangulate(c);
      for (let q = 0; q < c.queryX.length; q++) {
        expectScipyAnswer(triangulation, c, q, scanTriangles(triangulation, c.queryX[q], c.queryY[q]));
      }
    });
  }

  it('falls back to the scan when the step limit is reached, and counts it', () => {
    const c = delaunayCases[0];
    const triangulation = triangulate(c);
    let fallbacks = 0;
    for (let q = 0; q < c.queryX.length; q++) {
      const before = triangulation.walkFallbacks;
      const found = locateTriangle(triangulation, c.queryX[q], c.queryY[q], 0, 1);
      expectScipyAnswer(triangulation, c, q, found);
      fallbacks += triangulation.walkFallbacks - before;
    }
    // One step ends the walk only where the query is in (or beyond a hull edge of) triangle 0.
    expect(fallbacks).toBeGreaterThan(c.queryX.length - 10);
    expect(triangulation.walkFallbacks).toBe(fallbacks);
    triangulate(c, triangulation);
    expect(triangulation.walkFallbacks).toBe(0);
  });

  it('answers outside, keeping the start, for a non-finite point, a start out of range, or no triangulation', () => {
    const triangulation = triangulate(delaunayCases[0]);
    expect(locateTriangle(triangulation, Number.NaN, 0, 7)).toBe(-8);
    expect(locateTriangle(triangulation, 0, Number.NEGATIVE_INFINITY, 7)).toBe(-8);
    const centre = locateTriangle(triangulation, 0.01, 0.02);
    expect(locateTriangle(triangulation, 0.01, 0.02, -5)).toBe(centre);
    expect(locateTriangle(triangulation, 0.01, 0.02, 1e9)).toBe(centre);
    const failed = new DelaunayTriangulation();
    failed.rebuild(Float64Array.from([0, 1, 2]), Float64Array.from([0, 1, 2]));
    expect(locateTriangle(failed, 0.5, 0.5)).toBe(-1);
    expect(scanTriangles(failed, 0.5, 0.5)).toBe(-1);
  });
});
