import { readFileSync } from 'node:fs';
import { DelaunayTriangulation } from '../../../src/numeric/geometry/index.js';

/** One point set of fixtures/delaunay.json, with scipy.spatial's answers for it. */
export interface DelaunayCase {
  name: string;
  x: number[];
  y: number[];
  /** Delaunay.simplices, each triple sorted, the list sorted. */
  triangles: number[][];
  /** Delaunay.vertex_neighbor_vertices, each row sorted. */
  neighbours: number[][];
  /** ConvexHull.vertices, sorted. */
  hullVertices: number[];
  /** ConvexHull.volume (the hull's area in 2-D). */
  hullArea: number;
  /** A third of the areas of the scipy triangles around each vertex (numpy). */
  vertexAreas: number[];
  queryX: number[];
  queryY: number[];
  /** Vertices of find_simplex's triangle, or null outside the hull. */
  queryVertices: (number[] | null)[];
  /** Weights of those vertices from Delaunay.transform. */
  queryWeights: (number[] | null)[];
  /** 2-norm condition number of the triangle's barycentric transform. */
  queryConditionNumbers: (number | null)[];
}

/** Made by fixtures/make_delaunay.py from scipy.spatial.Delaunay (Qhull), python3-scipy. */
export const delaunayCases: DelaunayCase[] = (
  JSON.parse(readFileSync(new URL('./fixtures/delaunay.json', import.meta.url), 'utf8')) as { cases: DelaunayCase[] }
).cases;

/** A triangulation of the case's vertices. */
export function triangulate(c: DelaunayCase, triangulation = new DelaunayTriangulation()): DelaunayTriangulation {
  triangulation.rebuild(Float64Array.from(c.x), Float64Array.from(c.y));
  return triangulation;
}

/** Sorted vertex triples of a triangulation, as in the fixture. */
export function sortedTriples(triangulation: DelaunayTriangulation): number[][] {
  const triples: number[][] = [];
  for (let t = 0; t < triangulation.triangleCount; t++) {
    triples.push(Array.from(triangulation.triangles.subarray(3 * t, 3 * t + 3)).sort((a, b) => a - b));
  }
  return triples.sort((a, b) => a[0] - b[0] || a[1] - b[1] || a[2] - b[2]);
}
