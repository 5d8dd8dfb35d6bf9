import type { DelaunayTriangulation } from './delaunayTriangulation.js';
import { locateTriangle } from './locateTriangle.js';

/** Most natural neighbours a query may have; a query with more (a degenerate cluster) is weighed by its triangle. */
export const MAX_NATURAL_NEIGHBOURS = 16;

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
 */
export class NaturalNeighbourWeights {
  /** Queries weighed by their triangle (barycentric) because they had too many neighbours, since the last call. */
  fallbacks = 0;
  /** seen[t] === generation: triangle t was tested for this query; member[t] === generation: it is in the cavity. */
  private seen = new Int32Array(0);
  private member = new Int32Array(0);
  private generation = 0;
  private stack = new Int32Array(64);
  private cavity = new Int32Array(64);
  private edgeFrom = new Int32Array(64);
  private edgeTo = new Int32Array(64);
  /** Per triangle at 3t: its circumcentre and squared radius, for the calls' in-circle tests. */
  private circles = new Float64Array(0);
  private readonly ring = new Int32Array(MAX_NATURAL_NEIGHBOURS);
  private readonly centreX = new Float64Array(MAX_NATURAL_NEIGHBOURS);
  private readonly centreY = new Float64Array(MAX_NATURAL_NEIGHBOURS);

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
      this.member = new Int32Array(size);
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
    const cavityCount = this.collectCavity(triangulation, x, y, start);
    const ringCount = this.orderRing(triangulation, cavityCount);
    if (ringCount >= 3 && ringCount <= MAX_NATURAL_NEIGHBOURS) {
      const written = this.laplaceWeights(triangulation.coords, x, y, ringCount, vertices, weights, at);
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

  /** The triangles whose circumcircle holds (x, y), by a search from `start` across edges; returns how many. */
  private collectCavity(triangulation: DelaunayTriangulation, x: number, y: number, start: number): number {
    const { halfedges } = triangulation;
    const generation = ++this.generation;
    const { seen, member, circles } = this;
    let top = 0;
    let found = 0;
    this.stack[top++] = start;
    seen[start] = generation;
    while (top > 0) {
      const t = this.stack[--top];
      if (found >= this.cavity.length) this.cavity = grow(this.cavity);
      this.cavity[found++] = t;
      member[t] = generation;
      for (let k = 0; k < 3; k++) {
        const twin = halfedges[3 * t + k];
        if (twin < 0) continue;
        const u = (twin / 3) | 0;
        if (seen[u] === generation) continue;
        seen[u] = generation;
        const dx = x - circles[3 * u], dy = y - circles[3 * u + 1];
        if (!(dx * dx + dy * dy <= circles[3 * u + 2])) continue;
        if (top >= this.stack.length) this.stack = grow(this.stack);
        this.stack[top++] = u;
      }
    }
    return found;
  }

  /**
   * The cavity's boundary as a ring of vertices in order (each boundary half-edge runs from one
   * ring vertex to the next); returns the ring's length (0 when the boundary is not one ring).
   */
  private orderRing(triangulation: DelaunayTriangulation, cavityCount: number): number {
    const { triangles, halfedges } = triangulation;
    const generation = this.generation;
    let edges = 0;
    for (let c = 0; c < cavityCount; c++) {
      const t = this.cavity[c];
      for (let k = 0; k < 3; k++) {
        const e = 3 * t + k;
        const twin = halfedges[e];
        if (twin >= 0 && this.member[(twin / 3) | 0] === generation) continue;
        if (edges >= this.edgeFrom.length) {
          this.edgeFrom = grow(this.edgeFrom);
          this.edgeTo = grow(this.edgeTo);
        }
        this.edgeFrom[edges] = triangles[e];
        this.edgeTo[edges] = triangles[k === 2 ? e - 2 : e + 1];
        edges++;
      }
    }
    if (edges > MAX_NATURAL_NEIGHBOURS) return edges;
    const ring = this.ring;
    ring[0] = this.edgeFrom[0];
    let next = this.edgeTo[0];
    for (let r = 1; r < edges; r++) {
      let k = 0;
      while (k < edges && this.edgeFrom[k] !== next) k++;
      if (k === edges) return 0;
      ring[r] = next;
      next = this.edgeTo[k];
    }
    return next === ring[0] ? edges : 0;
  }

  /**
   * w_j proportional to s_j / d_j over the ring (Sukumar et al. 2001, eq. 9): the Voronoi edge of
   * q and ring vertex j runs between the circumcentres of (q, v_(j-1), v_j) and (q, v_j, v_(j+1)).
   * Returns the entries written, 0 when a circumcentre is not finite (q on a ring edge), for the
   * caller's fallback.
   */
  private laplaceWeights(
    coords: Float64Array, x: number, y: number, n: number, vertices: Int32Array, weights: Float64Array, at: number,
  ): number {
    const { ring, centreX, centreY } = this;
    for (let j = 0; j < n; j++) {
      const a = 2 * ring[j], b = 2 * ring[j + 1 === n ? 0 : j + 1];
      const ax = coords[a] - x, ay = coords[a + 1] - y, bx = coords[b] - x, by = coords[b + 1] - y;
      const d = 2 * (ax * by - ay * bx);
      const a2 = ax * ax + ay * ay, b2 = bx * bx + by * by;
      const cx = (by * a2 - ay * b2) / d, cy = (ax * b2 - bx * a2) / d;
      if (!(Math.abs(cx) < Infinity && Math.abs(cy) < Infinity)) return 0;
      centreX[j] = cx;
      centreY[j] = cy;
    }
    let sum = 0;
    for (let j = 0; j < n; j++) {
      const v = 2 * ring[j];
      const dx = coords[v] - x, dy = coords[v + 1] - y;
      const distance = Math.sqrt(dx * dx + dy * dy);
      const previous = j === 0 ? n - 1 : j - 1;
      const ex = centreX[j] - centreX[previous], ey = centreY[j] - centreY[previous];
      const s = Math.sqrt(ex * ex + ey * ey);
      if (distance === 0) {
        // The query sits on vertex j: it takes that vertex's value.
        vertices[at] = ring[j];
        weights[at] = 1;
        return 1;
      }
      const w = s / distance;
      vertices[at + j] = ring[j];
      weights[at + j] = w;
      sum += w;
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

function grow(buffer: Int32Array): Int32Array<ArrayBuffer> {
  const bigger = new Int32Array(2 * buffer.length);
  bigger.set(buffer);
  return bigger;
}
