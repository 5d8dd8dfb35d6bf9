import type { DelaunayTriangulation } from './delaunayTriangulation.js';

/**
 * A point whose barycentric coordinates are all >= -BARYCENTRIC_TOLERANCE is inside the
 * triangle: 100 machine epsilons, the default of scipy's Delaunay.find_simplex, so that a point
 * on a shared edge is found in either triangle instead of bouncing between them.
 */
export const BARYCENTRIC_TOLERANCE = 100 * 2 ** -52;

/** What `walkToTriangle` returns when it reaches its step limit (a small integer below -1 - any t). */
const GAVE_UP = -0x40000000;

/**
 * The triangle holding (x, y), as t >= 0, or -1 - t when the point is outside the convex hull,
 * t then being the hull triangle the search ended in (a good start for the next, nearby query).
 * Starts at `startTriangle` (the previous query's answer for coherent queries) and walks; after
 * maxSteps triangles (a walk in a Delaunay triangulation never visits one twice) it counts a
 * fallback on the triangulation and scans every triangle. Without triangles, or for a non-finite
 * point, returns -1 - startTriangle (outside).
 */
export function locateTriangle(
  triangulation: DelaunayTriangulation, x: number, y: number, startTriangle = 0,
  maxSteps = triangulation.triangleCount + 1,
): number {
  const count = triangulation.triangleCount;
  const start = startTriangle >= 0 && startTriangle < count ? startTriangle : 0;
  if (count === 0 || !(Math.abs(x) < Infinity && Math.abs(y) < Infinity)) return -1 - start;
  const found = walkToTriangle(triangulation, x, y, start, maxSteps);
  if (found !== GAVE_UP) return found;
  triangulation.walkFallbacks++;
  return scanTriangles(triangulation, x, y);
}

// Visibility walk (Lawson 1977; Devillers, Pion & Teillaud 2002): leave each triangle
// across an edge that has the point strictly beyond it, here the one opposite the most negative
// barycentric coordinate; it ends on Delaunay triangulations (Edelsbrunner 1990, acyclicity).
function walkToTriangle(
  triangulation: DelaunayTriangulation, x: number, y: number, start: number, maxSteps: number,
): number {
  const m = triangulation.barycentricTransforms;
  const halfedges = triangulation.halfedges;
  let t = start;
  for (let step = 0; step < maxSteps; step++) {
    const o = 6 * t;
    const dx = x - m[o];
    const dy = y - m[o + 1];
    const la = m[o + 2] * dx + m[o + 3] * dy;
    const lb = m[o + 4] * dx + m[o + 5] * dy;
    const lc = 1 - la - lb;
    // Vertex a is opposite half-edge 3t + 1 (b -> c), b opposite 3t + 2, c opposite 3t.
    let edge: number;
    if (la <= lb && la <= lc) {
      if (la >= -BARYCENTRIC_TOLERANCE) return t;
      edge = 3 * t + 1;
    } else if (lb <= lc) {
      if (lb >= -BARYCENTRIC_TOLERANCE) return t;
      edge = 3 * t + 2;
    } else {
      if (lc >= -BARYCENTRIC_TOLERANCE) return t;
      edge = 3 * t;
    }
    const twin = halfedges[edge];
    if (twin < 0) return -1 - t;
    t = (twin / 3) | 0;
  }
  return GAVE_UP;
}

// Brute-force point location: the triangle whose smallest barycentric coordinate is largest.
export function scanTriangles(triangulation: DelaunayTriangulation, x: number, y: number): number {
  const m = triangulation.barycentricTransforms;
  let best = 0;
  let bestLeast = -Infinity;
  for (let t = 0; t < triangulation.triangleCount; t++) {
    const o = 6 * t;
    const dx = x - m[o];
    const dy = y - m[o + 1];
    const la = m[o + 2] * dx + m[o + 3] * dy;
    const lb = m[o + 4] * dx + m[o + 5] * dy;
    const least = Math.min(la, lb, 1 - la - lb);
    if (least > bestLeast) {
      bestLeast = least;
      best = t;
    }
  }
  return bestLeast >= -BARYCENTRIC_TOLERANCE ? best : -1 - best;
}
