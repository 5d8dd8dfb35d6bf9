import Delaunator from 'delaunator';
import { TriangulationStatus, type TriangulationStatusCode } from './triangulationStatus.js';

const NO_TRIANGLES = new Uint32Array(0);
const NO_HALFEDGES = new Int32Array(0);

/**
 * The Delaunay triangulation of a set of 2-D vertices, rebuilt in place at every call (an adaptive
 * source grid's vertices move with the lens model). The triangulation itself is delaunator's
 * (sweep-hull insertion with Delaunay edge flips); for a point count equal to the last one its
 * buffers are reused through `Delaunator.update()`, so a rebuild allocates only delaunator's
 * small hull array, two typed-array views and its circumcentre object. A failed rebuild leaves
 * no triangles and a status saying why; queries on it report every point outside.
 *
 * Layout (delaunator's): triangle t has vertices triangles[3t], [3t+1], [3t+2], clockwise with
 * the y axis up (delaunator's "counter-clockwise" takes y pointing down); half-edge e runs from
 * vertex triangles[e] to triangles[3t + (e + 1) % 3] and halfedges[e] is its twin in the
 * neighbouring triangle, or -1 on the convex hull.
 */
export class DelaunayTriangulation {
  /** Vertex coordinates, interleaved: x of vertex k at 2k, y at 2k + 1. */
  coords = new Float64Array(0);
  vertexCount = 0;
  triangleCount = 0;
  status: TriangulationStatusCode = TriangulationStatus.tooFewPoints;
  /** Vertex indices, three per triangle, clockwise with y up. */
  triangles: Uint32Array = NO_TRIANGLES;
  /** Twin of each half-edge, -1 on the hull. */
  halfedges: Int32Array = NO_HALFEDGES;
  /** Hull vertices, clockwise with y up. */
  hull: Uint32Array = NO_TRIANGLES;
  /**
   * Per triangle t, at 6t: the third vertex (x, y) and the rows of the inverse of
   * [[xa - xc, xb - xc], [ya - yc, yb - yc]], so that the barycentric coordinates of (x, y) are
   * la = m00 dx + m01 dy, lb = m10 dx + m11 dy, lc = 1 - la - lb with (dx, dy) = (x - xc, y - yc).
   */
  barycentricTransforms = new Float64Array(0);
  /** Area of each triangle (positive; the vertex order is clockwise with y up). */
  triangleAreas = new Float64Array(0);
  /** Point locations that gave up walking and scanned every triangle, since the last rebuild. */
  walkFallbacks = 0;

  private delaunator: Delaunator<Float64Array> | null = null;
  private vertexUsed = new Uint8Array(0);

  /** True when the last rebuild gave a triangulation. */
  get ok(): boolean {
    return this.status === TriangulationStatus.ok;
  }

  /** Triangulates vertices (x[k], y[k]), k < count; returns (and keeps) the status. */
  rebuild(x: Float64Array, y: Float64Array, count: number = x.length): TriangulationStatusCode {
    if (count > x.length || count > y.length) {
      throw new RangeError(`DelaunayTriangulation.rebuild: ${count} vertices asked, coordinate arrays hold ${Math.min(x.length, y.length)}`);
    }
    this.clear(count);
    if (count < 3) return this.fail(TriangulationStatus.tooFewPoints);
    if (this.coords.length !== 2 * count) this.resize(count);
    if (!this.copyVertices(x, y, count)) return this.fail(TriangulationStatus.nonFinitePoint);
    if (this.delaunator === null) this.delaunator = new Delaunator(this.coords);
    else this.delaunator.update();
    const d = this.delaunator;
    if (d.triangles.length === 0) return this.fail(TriangulationStatus.collinear);
    this.triangles = d.triangles;
    this.halfedges = d.halfedges;
    this.hull = d.hull;
    this.triangleCount = d.triangles.length / 3;
    this.markUsedVertices();
    if (this.usedVertexCount() < count) return this.fail(TriangulationStatus.duplicatePoints);
    if (!this.writeTransforms()) return this.fail(TriangulationStatus.flatTriangle);
    this.status = TriangulationStatus.ok;
    return this.status;
  }

  private clear(count: number): void {
    this.vertexCount = count;
    this.triangleCount = 0;
    this.triangles = NO_TRIANGLES;
    this.halfedges = NO_HALFEDGES;
    this.hull = NO_TRIANGLES;
    this.walkFallbacks = 0;
  }

  private fail(status: TriangulationStatusCode): TriangulationStatusCode {
    this.clear(this.vertexCount);
    this.status = status;
    return status;
  }

  /** New buffers for a new point count; delaunator sizes its own from `coords` at construction. */
  private resize(count: number): void {
    this.coords = new Float64Array(2 * count);
    this.delaunator = null;
    this.vertexUsed = new Uint8Array(count);
    const maxTriangles = Math.max(2 * count - 5, 0);
    this.barycentricTransforms = new Float64Array(6 * maxTriangles);
    this.triangleAreas = new Float64Array(maxTriangles);
  }

  /** Interleaves the vertices into `coords`; false when one is not finite. */
  private copyVertices(x: Float64Array, y: Float64Array, count: number): boolean {
    const coords = this.coords;
    let finite = true;
    for (let k = 0; k < count; k++) {
      const xk = x[k];
      const yk = y[k];
      coords[2 * k] = xk;
      coords[2 * k + 1] = yk;
      if (!(Math.abs(xk) < Infinity && Math.abs(yk) < Infinity)) finite = false;
    }
    return finite;
  }

  /** Flags the vertices some triangle uses (delaunator leaves coincident points out). */
  private markUsedVertices(): void {
    const used = this.vertexUsed;
    const triangles = this.triangles;
    used.fill(0, 0, this.vertexCount);
    for (let e = 0; e < triangles.length; e++) used[triangles[e]] = 1;
  }

  private usedVertexCount(): number {
    const used = this.vertexUsed;
    let sum = 0;
    for (let k = 0; k < this.vertexCount; k++) sum += used[k];
    return sum;
  }

  // Barycentric coordinates as the solution of a 2x2 linear system (Moebius 1827), as scipy's
  // Delaunay.transform stores them (inverse matrix and offset vertex); false on a flat triangle.
  private writeTransforms(): boolean {
    const coords = this.coords;
    const triangles = this.triangles;
    const out = this.barycentricTransforms;
    const areas = this.triangleAreas;
    let positive = true;
    for (let t = 0; t < this.triangleCount; t++) {
      const a = 2 * triangles[3 * t];
      const b = 2 * triangles[3 * t + 1];
      const c = 2 * triangles[3 * t + 2];
      const xc = coords[c];
      const yc = coords[c + 1];
      const ax = coords[a] - xc;
      const ay = coords[a + 1] - yc;
      const bx = coords[b] - xc;
      const by = coords[b + 1] - yc;
      const det = ax * by - bx * ay;
      const o = 6 * t;
      out[o] = xc;
      out[o + 1] = yc;
      out[o + 2] = by / det;
      out[o + 3] = -bx / det;
      out[o + 4] = -ay / det;
      out[o + 5] = ax / det;
      areas[t] = -0.5 * det;
      if (!(det < 0)) positive = false;
    }
    return positive;
  }
}
