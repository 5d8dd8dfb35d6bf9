import type { DelaunayTriangulation } from './delaunayTriangulation.js';
import type { VertexAdjacency } from './vertexAdjacency.js';

/**
 * The cotangent weights of a triangulation's edges, aligned with VertexAdjacency's neighbour
 * lists: out[k] for the edge from vertex i to neighbours[k] is (cot alpha + cot beta) / 2, alpha
 * and beta the angles opposite the edge in its one or two triangles. They make the stiffness
 * matrix of piecewise-linear elements, sum_edges w_ij (s_i - s_j)^2 = integral of |grad s|^2 for
 * the linear interpolant s (Duffin 1959; Pinkall & Polthier 1993, eq. 5). On a Delaunay
 * triangulation an interior edge's weight is >= 0 and falls to 0 as the edge becomes flippable,
 * so the energy is continuous through edge flips. `out` needs adjacency.offsets[n] entries.
 */
export function cotangentWeights(triangulation: DelaunayTriangulation, adjacency: VertexAdjacency, out: Float64Array): void {
  const { triangles, coords } = triangulation;
  const { offsets, neighbours } = adjacency;
  out.fill(0, 0, offsets[adjacency.vertexCount]);
  for (let t = 0; t < triangulation.triangleCount; t++) {
    for (let k = 0; k < 3; k++) {
      const a = triangles[3 * t + k];
      const b = triangles[3 * t + (k + 1) % 3];
      const c = triangles[3 * t + (k + 2) % 3];
      const ux = coords[2 * a] - coords[2 * c], uy = coords[2 * a + 1] - coords[2 * c + 1];
      const vx = coords[2 * b] - coords[2 * c], vy = coords[2 * b + 1] - coords[2 * c + 1];
      const half = (0.5 * (ux * vx + uy * vy)) / Math.abs(ux * vy - uy * vx);
      addToEdge(offsets, neighbours, out, a, b, half);
      addToEdge(offsets, neighbours, out, b, a, half);
    }
  }
}

function addToEdge(offsets: Int32Array, neighbours: Int32Array, out: Float64Array, from: number, to: number, value: number): void {
  for (let k = offsets[from]; k < offsets[from + 1]; k++) {
    if (neighbours[k] === to) {
      out[k] += value;
      return;
    }
  }
}
