import type { DelaunayTriangulation } from './delaunayTriangulation.js';
import { locateTriangle } from './locateTriangle.js';

/**
 * Most natural neighbours a query may have; a query with more (a degenerate cluster) is weighed
 * by its triangle. A mesh whose cells crowd on the arcs (brightShare) gives rings of up to 19 on
 * lenses drawn across the pixelated demo's prior; the entries past a ray's ring cost nothing
 * (the mapping stops at the first unused one).
 */
export const MAX_NATURAL_NEIGHBOURS = 24;

/**
 * Laplace natural-neighbour interpolation weights (Belikov, Ivanov, Kontorovich, Korytnik &
 * Semenov 1997; Sukumar, Moran, Semenov & Belikov 2001, Int. J. Numer. Meth. Eng. 50, 1, eq. 9):
 * a query point q takes as neighbours the vertices whose Voronoi cells it would take area from
 * (the vertices of the Delaunay triangles whose circumcircle holds q: Bowyer 1981, Watson 1981;
 * each triangle's circle computed once per call),
 * and vertex j gets w_j = (s_j / d_j) / sum_k (s_k / d_k), s_j the length of the Voronoi edge q
 * would share with j, d_j = |q - v_j|. Unlike the barycentric weights of the holding triangle, the
 * weights are continuous in the query and in the vertex positions (a vertex joins or leaves with
 * weight 0, also when the triangulation flips an edge), they are non-negative, sum to 1, and
 * reproduce linear functions. Each query writes MAX_NATURAL_NEIGHBOURS entries (vertex -1,
 * weight 0 for the unused); a point outside the convex hull gets none. Buffers are reused.
 * Its WebAssembly twin is naturalNeighbourKernel.ts, tested against it bit for bit in
 * test/numeric/geometry/naturalNeighbourKernel.test.ts.
 */
export class NaturalNeighbourWeights {
  /**
   * Queries weighed by their triangle (barycentric) since the last call: more than
   * MAX_NATURAL_NEIGHBOURS neighbours, a ring that does not close, or a flat ring triangle.
   */
  fallbacks = 0;
  /** seen[t] === generation: triangle t is in this query's cavity. */
  private seen = new Int32Array(0);
  private generation = 0;
  /** Per triangle at 3t: its circumcentre and squared radius, for the calls' in-circle tests. */
  private circles = new Float64Array(0);
  /** The ring being dug (its vertices), and the half-edges still to visit while digging it. */
  private readonly ring = new Int32Array(MAX_NATURAL_NEIGHBOURS);
  private readonly stack = new Int32Array(4 * MAX_NATURAL_NEIGHBOURS);

  /**
   * Weights of the count queries (qx[i], qy[i]) into vertices / weights at
   * MAX_NATURAL_NEIGHBOURS * i; returns how many queries were outside the hull.
   */
  weigh(
    triangulation: DelaunayTriangulation, qx: Float64Array, qy: Float64Array, count: number,
    vertices: Int32Array, weights: Float64Array,
  ): number {
    const per = MAX_NATURAL_NEIGHBOURS;
    if (count > qx.length || count > qy.length || per * count > vertices.length || per * count > weights.length) {
      throw new RangeError(`NaturalNeighbourWeights: ${count} queries do not fit the given arrays`);
    }
    if (this.seen.length < triangulation.triangleCount || this.generation > 0x3fffffff) {
      const size = Math.max(triangulation.triangleCount, 2 * this.seen.length);
      this.seen = new Int32Array(size);
      this.generation = 0;
    }
    this.fallbacks = 0;
    this.writeCircles(triangulation);
    let hint = 0;
    let outside = 0;
    for (let i = 0; i < count; i++) {
      const at = per * i;
      const found = locateTriangle(triangulation, qx[i], qy[i], hint);
      let written = 0;
      if (found < 0) {
        hint = -1 - found;
        outside++;
      } else {
        hint = found;
        written = this.weighOne(triangulation, qx[i], qy[i], found, vertices, weights, at);
      }
      clearTail(vertices, weights, at + written, at + per);
    }
    return outside;
  }

  /** The weights of one query inside triangle `start`; returns how many entries it wrote. */
  private weighOne(
    triangulation: DelaunayTriangulation, x: number, y: number, start: number,
    vertices: Int32Array, weights: Float64Array, at: number,
  ): number {
    // A query on a vertex (a traced pixel centre that is also a vertex) takes its value.
    const { triangles, coords } = triangulation;
    for (let k = 3 * start; k < 3 * start + 3; k++) {
      const v = triangles[k];
      if (coords[2 * v] === x && coords[2 * v + 1] === y) {
        vertices[at] = v;
        weights[at] = 1;
        return 1;
      }
    }
    const ringCount = this.digRing(triangulation, x, y, start);
    if (ringCount >= 3) {
      const written = this.laplaceWeights(coords, x, y, ringCount, vertices, weights, at);
      if (written > 0) return written;
    }
    this.fallbacks++;
    triangleWeights(triangulation, x, y, start, vertices, weights, at);
    return 3;
  }

  /** Circumcentre and squared circumradius of every triangle (a flat one gets an infinite circle). */
  private writeCircles(triangulation: DelaunayTriangulation): void {
    const { triangles, coords, triangleCount } = triangulation;
    if (this.circles.length < 3 * triangleCount) this.circles = new Float64Array(3 * triangleCount);
    const circles = this.circles;
    for (let t = 0; t < triangleCount; t++) {
      const a = 2 * triangles[3 * t], b = 2 * triangles[3 * t + 1], c = 2 * triangles[3 * t + 2];
      const ax = coords[a], ay = coords[a + 1];
      const bx = coords[b] - ax, by = coords[b + 1] - ay, cx = coords[c] - ax, cy = coords[c + 1] - ay;
      const d = 2 * (bx * cy - by * cx);
      const b2 = bx * bx + by * by, c2 = cx * cx + cy * cy;
      const ux = (cy * b2 - by * c2) / d, uy = (bx * c2 - cx * b2) / d;
      circles[3 * t] = ax + ux;
      circles[3 * t + 1] = ay + uy;
      circles[3 * t + 2] = ux * ux + uy * uy;
    }
  }

  /**
   * The ring of q's natural neighbours in order, from the triangles whose circumcircle holds
   * (x, y) (the Bowyer-Watson cavity), dug from `start` across edges. The cavity is a polygon
   * whose vertices all lie on its boundary, so its triangles' adjacency is a tree: visiting each
   * triangle's two further edges in turn, depth first, meets the boundary edges in order around
   * the ring, clockwise as the triangles run, and the ring is the start of each. The depth-first
   * order is kept on a stack of half-edges (popped in the order a recursion would visit them).
   * Returns the ring's length, 0 when it is longer than MAX_NATURAL_NEIGHBOURS or does not close
   * (a cavity made inconsistent by rounding), for the caller's fallback.
   */
  private digRing(triangulation: DelaunayTriangulation, x: number, y: number, start: number): number {
    const { halfedges, triangles } = triangulation;
    const circles = this.circles, seen = this.seen, ring = this.ring, stack = this.stack;
    const generation = ++this.generation;
    seen[start] = generation;
    let n = 0;
    let lastTo = -1;
    const e0 = 3 * start;
    stack[0] = e0 + 2;
    stack[1] = e0 + 1;
    stack[2] = e0;
    let depth = 3;
    while (depth > 0) {
      const e = stack[--depth];
      const twin = halfedges[e];
      if (twin >= 0) {
        const u = (twin / 3) | 0;
        const dx = x - circles[3 * u], dy = y - circles[3 * u + 1];
        if (dx * dx + dy * dy <= circles[3 * u + 2]) {
          // Into the cavity triangle beyond e: a second visit means the cavity is not a tree.
          // A stack this deep means more than MAX_NATURAL_NEIGHBOURS ring edges (a cavity of
          // T triangles has T + 2): the fallback either way.
          if (seen[u] === generation || depth + 2 > stack.length) return 0;
          seen[u] = generation;
          const base = 3 * u, k = twin - base;
          stack[depth++] = k === 0 ? base + 2 : twin - 1;
          stack[depth++] = k === 2 ? base : twin + 1;
          continue;
        }
      }
      // A boundary edge: its start joins the ring, and must be where the last one ended.
      const from = triangles[e];
      if (n === MAX_NATURAL_NEIGHBOURS || (lastTo >= 0 && lastTo !== from)) return 0;
      ring[n++] = from;
      const base = e - (e % 3);
      lastTo = triangles[e === base + 2 ? base : e + 1];
    }
    return lastTo === ring[0] ? n : 0;
  }

  /**
   * w_j proportional to s_j / d_j over the ring (Sukumar et al. 2001, eq. 9). The Voronoi edge of
   * q and ring vertex j joins the circumcentres of the triangles (q, v_(j-1), v_j) and
   * (q, v_j, v_(j+1)); its length over d_j is (cot alpha_j + cot beta_j) / 2, alpha_j and beta_j
   * the angles at v_(j-1) and v_(j+1) opposite the edge q v_j (a Voronoi edge over its Delaunay
   * edge, the cotangent weight of cotangentWeights.ts), and both cotangents of a triangle share
   * its doubled area: one division per ring vertex and no square root. Returns the entries
   * written, 0 when a triangle is flat or folded (q on a ring edge) for the caller's fallback.
   */
  private laplaceWeights(
    coords: Float64Array, x: number, y: number, n: number, vertices: Int32Array, weights: Float64Array, at: number,
  ): number {
    const ring = this.ring;
    for (let j = 0; j < n; j++) weights[at + j] = 0;
    for (let j = 0; j < n; j++) {
      const next = j + 1 === n ? 0 : j + 1;
      const a = 2 * ring[j], b = 2 * ring[next];
      const ax = coords[a] - x, ay = coords[a + 1] - y, bx = coords[b] - x, by = coords[b + 1] - y;
      // Twice the area of (q, a, b), positive as the ring turns clockwise around q (the
      // triangulation's half-edges run clockwise, so the cavity's boundary does).
      const area2 = ay * bx - ax * by;
      if (!(area2 > 0)) return 0;
      const ex = bx - ax, ey = by - ay;
      const inverse = 1 / area2;
      // cot of the angle at a, between a -> q and a -> b; it sits opposite the edge q b.
      weights[at + next] += (ey * ay + ex * ax) * -inverse;
      // cot of the angle at b, between b -> q and b -> a; it sits opposite the edge q a.
      weights[at + j] += (ex * bx + ey * by) * inverse;
    }
    let sum = 0;
    for (let j = 0; j < n; j++) {
      vertices[at + j] = ring[j];
      sum += weights[at + j];
    }
    if (!(sum > 0 && sum < Infinity)) return 0;
    const inverse = 1 / sum;
    for (let j = 0; j < n; j++) weights[at + j] *= inverse;
    return n;
  }
}

/** Entries [from, to) unused: vertex -1, weight 0. */
function clearTail(vertices: Int32Array, weights: Float64Array, from: number, to: number): void {
  for (let k = from; k < to; k++) {
    vertices[k] = -1;
    weights[k] = 0;
  }
}

/** The barycentric weights of (x, y) in triangle t (the fallback), in the first three entries. */
function triangleWeights(triangulation: DelaunayTriangulation, x: number, y: number, t: number, vertices: Int32Array, weights: Float64Array, at: number): void {
  const m = triangulation.barycentricTransforms;
  const o = 6 * t;
  const dx = x - m[o], dy = y - m[o + 1];
  const la = m[o + 2] * dx + m[o + 3] * dy;
  const lb = m[o + 4] * dx + m[o + 5] * dy;
  vertices[at] = triangulation.triangles[3 * t];
  vertices[at + 1] = triangulation.triangles[3 * t + 1];
  vertices[at + 2] = triangulation.triangles[3 * t + 2];
  weights[at] = la;
  weights[at + 1] = lb;
  weights[at + 2] = 1 - la - lb;
}
