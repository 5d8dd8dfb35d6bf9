// Tests of src/numeric/geometry/vertexAreas.ts against areas from scipy's triangles and ConvexHull.
import { describe, expect, it } from 'vitest';
import { DelaunayTriangulation, vertexAreas } from '../../../src/numeric/geometry/index.js';
import { delaunayCases, triangulate } from './delaunayFixture.js';

const EPS = 2 ** -52;

describe('vertexAreas', () => {
  for (const c of delaunayCases) {
    it(`${c.name}: a third of the scipy triangles around each vertex; they add up to ConvexHull.volume`, () => {
      const out = new Float64Array(c.x.length);
      vertexAreas(triangulate(c), out);
      // Same triangles, areas from other corners and summed in another order: a triangle's area
      // from either corner rounds within eps of the two products of its determinant (their
      // absolute sum, up to 1.3 on the uniform square's hull slivers), and a vertex's sum of
      // deg terms rounds within deg eps of it.
      const bound = new Float64Array(c.x.length);
      for (const [a, b, d] of c.triangles) {
        const first = Math.abs((c.x[b] - c.x[a]) * (c.y[d] - c.y[a]));
        const second = Math.abs((c.y[b] - c.y[a]) * (c.x[d] - c.x[a]));
        for (const k of [a, b, d]) bound[k] += (4 * EPS * (first + second)) / 3;
      }
      for (let k = 0; k < c.x.length; k++) {
        const tolerance = bound[k] + c.neighbours[k].length * EPS * c.vertexAreas[k];
        expect(Math.abs(out[k] - c.vertexAreas[k]), `vertex ${k}`).toBeLessThanOrEqual(tolerance);
      }
      // Qhull's hull area comes from the hull alone; the total differs by the triangles' rounding
      // above and the sum of n positive terms, within n eps of the total.
      const total = out.reduce((sum, area) => sum + area, 0);
      const triangleRounding = bound.reduce((sum, b) => sum + b, 0);
      expect(Math.abs(total - c.hullArea)).toBeLessThanOrEqual(triangleRounding + c.x.length * EPS * c.hullArea);
    });
  }

  it('writes zeros when the triangulation failed, and refuses a short output', () => {
    const triangulation = new DelaunayTriangulation();
    triangulation.rebuild(Float64Array.from([0, 1, 2]), Float64Array.from([5, 5, 5]));
    const out = new Float64Array(3).fill(7);
    vertexAreas(triangulation, out);
    expect(Array.from(out)).toEqual([0, 0, 0]);
    expect(() => vertexAreas(triangulation, new Float64Array(2))).toThrow(RangeError);
  });
});
