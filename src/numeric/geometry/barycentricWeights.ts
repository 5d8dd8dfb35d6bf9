import type { DelaunayTriangulation } from './delaunayTriangulation.js';
import { locateTriangle } from './locateTriangle.js';

/**
 * For query points (qx[i], qy[i]), i < count: the three vertices of the triangle holding each,
 * into vertices[3i..3i+2], and their barycentric weights, into weights[3i..3i+2] (they sum to 1
 * and reproduce linear functions). A point outside the convex hull gets vertices -1 and weights 0.
 * Each search starts where the previous one ended, so spatially coherent queries (consecutive
 * rays are neighbours) take a step or two each. Returns how many points were outside.
 * Allocates nothing; the buffers are the caller's.
 */
export function barycentricWeights(
  triangulation: DelaunayTriangulation, qx: Float64Array, qy: Float64Array, count: number,
  vertices: Int32Array, weights: Float64Array,
): number {
  if (count > qx.length || count > qy.length || 3 * count > vertices.length || 3 * count > weights.length) {
    throw new RangeError(`barycentricWeights: ${count} queries do not fit the given arrays`);
  }
  return weighQueries(triangulation, qx, qy, count, vertices, weights);
}

// Linear interpolation in the Delaunay triangle holding each point, by its barycentric
// coordinates (Moebius 1827), as on the adaptive source grid of Vegetti & Koopmans 2009.
function weighQueries(
  triangulation: DelaunayTriangulation, qx: Float64Array, qy: Float64Array, count: number,
  vertices: Int32Array, weights: Float64Array,
): number {
  const m = triangulation.barycentricTransforms;
  const triangles = triangulation.triangles;
  let hint = 0;
  let outside = 0;
  for (let i = 0; i < count; i++) {
    const x = qx[i];
    const y = qy[i];
    const found = locateTriangle(triangulation, x, y, hint);
    const j = 3 * i;
    if (found < 0) {
      hint = -1 - found;
      vertices[j] = -1;
      vertices[j + 1] = -1;
      vertices[j + 2] = -1;
      weights[j] = 0;
      weights[j + 1] = 0;
      weights[j + 2] = 0;
      outside++;
      continue;
    }
    hint = found;
    const o = 6 * found;
    const dx = x - m[o];
    const dy = y - m[o + 1];
    const la = m[o + 2] * dx + m[o + 3] * dy;
    const lb = m[o + 4] * dx + m[o + 5] * dy;
    vertices[j] = triangles[3 * found];
    vertices[j + 1] = triangles[3 * found + 1];
    vertices[j + 2] = triangles[3 * found + 2];
    weights[j] = la;
    weights[j + 1] = lb;
    weights[j + 2] = 1 - la - lb;
  }
  return outside;
}
