import type { DelaunayTriangulation } from './delaunayTriangulation.js';

// Barycentric dual cell area: a third of the area of every triangle around the vertex (Meyer,
// Desbrun, Schroeder & Barr 2003, the alternative to the Voronoi region that stays bounded on
// the hull); the areas add up to the area of the convex hull. Writes out[k] for every vertex k;
// all zero when the triangulation failed.
export function vertexAreas(triangulation: DelaunayTriangulation, out: Float64Array): void {
  if (out.length < triangulation.vertexCount) {
    throw new RangeError(`vertexAreas: ${triangulation.vertexCount} vertices, output holds ${out.length}`);
  }
  out.fill(0, 0, triangulation.vertexCount);
  addTriangleThirds(triangulation, out);
}

function addTriangleThirds(triangulation: DelaunayTriangulation, out: Float64Array): void {
  const triangles = triangulation.triangles;
  const areas = triangulation.triangleAreas;
  for (let t = 0; t < triangulation.triangleCount; t++) {
    const third = areas[t] / 3;
    out[triangles[3 * t]] += third;
    out[triangles[3 * t + 1]] += third;
    out[triangles[3 * t + 2]] += third;
  }
}
