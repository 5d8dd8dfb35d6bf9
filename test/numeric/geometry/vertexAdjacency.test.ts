// Tests of src/numeric/geometry/vertexAdjacency.ts against scipy's Delaunay.vertex_neighbor_vertices.
import { describe, expect, it } from 'vitest';
import { DelaunayTriangulation, VertexAdjacency } from '../../../src/numeric/geometry/index.js';
import { delaunayCases, triangulate } from './delaunayFixture.js';

function rows(adjacency: VertexAdjacency): number[][] {
  const out: number[][] = [];
  for (let k = 0; k < adjacency.vertexCount; k++) {
    out.push(Array.from(adjacency.neighbours.subarray(adjacency.offsets[k], adjacency.offsets[k + 1])).sort((a, b) => a - b));
  }
  return out;
}

describe('VertexAdjacency', () => {
  for (const c of delaunayCases) {
    it(`${c.name}: the neighbours of scipy's vertex_neighbor_vertices and the hull of ConvexHull`, () => {
      const adjacency = new VertexAdjacency();
      adjacency.rebuild(triangulate(c));
      expect(adjacency.vertexCount).toBe(c.x.length);
      expect(rows(adjacency)).toEqual(c.neighbours);
      const onHull: number[] = [];
      for (let k = 0; k < adjacency.vertexCount; k++) if (adjacency.onHull[k] === 1) onHull.push(k);
      expect(onHull).toEqual(c.hullVertices);
      // Every edge is in two rows; Euler's formula gives 3n - 3 - h edges (common practice).
      expect(adjacency.offsets[c.x.length]).toBe(2 * (3 * c.x.length - 3 - c.hullVertices.length));
      expect(adjacency.degree(0)).toBe(c.neighbours[0].length);
    });
  }

  it('rebuilds in place for triangulations of other sizes, larger and smaller', () => {
    const adjacency = new VertexAdjacency();
    const triangulation = new DelaunayTriangulation();
    const [uniform, clustered] = delaunayCases;
    adjacency.rebuild(triangulate(uniform, triangulation));
    const neighbours = adjacency.neighbours;
    for (const c of [clustered, uniform]) {
      adjacency.rebuild(triangulate(c, triangulation));
      expect(rows(adjacency)).toEqual(c.neighbours);
      expect(adjacency.neighbours).toBe(neighbours);
    }
  });

  it('gives every vertex no neighbours when the triangulation failed', () => {
    const triangulation = new DelaunayTriangulation();
    triangulation.rebuild(Float64Array.from([0, 1, 2, 3]), Float64Array.from([0, 1, 2, 3]));
    const adjacency = new VertexAdjacency();
    adjacency.rebuild(triangulate(delaunayCases[0]));
    adjacency.rebuild(triangulation);
    expect(adjacency.vertexCount).toBe(4);
    expect(Array.from(adjacency.offsets.subarray(0, 5))).toEqual([0, 0, 0, 0, 0]);
    expect(Array.from(adjacency.onHull.subarray(0, 4))).toEqual([0, 0, 0, 0]);
  });
});
