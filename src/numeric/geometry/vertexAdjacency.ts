import type { DelaunayTriangulation } from './delaunayTriangulation.js';

/**
 * Each vertex's neighbours in a triangulation (the vertices it shares an edge with), in
 * compressed rows: the neighbours of vertex k are neighbours[offsets[k] .. offsets[k + 1] - 1],
 * in no particular order; and which vertices lie on the convex hull. For gradient and curvature
 * regularisation on an irregular source grid. Rebuilt in place; the buffers grow when a larger
 * triangulation needs it and are otherwise reused, so a rebuild allocates nothing.
 */
export class VertexAdjacency {
  vertexCount = 0;
  /** Row starts, vertexCount + 1 entries used. */
  offsets = new Int32Array(1);
  /** Neighbour indices, offsets[vertexCount] entries used (twice the number of edges). */
  neighbours = new Int32Array(0);
  /** 1 for a vertex on the convex hull, else 0. */
  onHull = new Uint8Array(0);

  private cursor = new Int32Array(0);

  // Neighbours read off the half-edge (doubly connected edge) list (Muller & Preparata 1978):
  // every half-edge gives its end to its start's row, and a hull half-edge, having no twin, also
  // its start to its end's row. A failed triangulation gives every vertex no neighbours.
  rebuild(triangulation: DelaunayTriangulation): void {
    const n = triangulation.vertexCount;
    if (this.offsets.length < n + 1) {
      this.offsets = new Int32Array(n + 1);
      this.cursor = new Int32Array(n);
      this.onHull = new Uint8Array(n);
    }
    this.vertexCount = n;
    this.offsets.fill(0, 0, n + 1);
    this.onHull.fill(0, 0, n);
    this.countRows(triangulation);
    this.accumulateOffsets(n);
    if (this.neighbours.length < this.offsets[n]) this.neighbours = new Int32Array(this.offsets[n]);
    this.fillRows(triangulation);
  }

  /** Degree of vertex k. */
  degree(k: number): number {
    return this.offsets[k + 1] - this.offsets[k];
  }

  /** offsets[k + 1] += degree of k, and the hull flags. */
  private countRows(triangulation: DelaunayTriangulation): void {
    const triangles = triangulation.triangles;
    const halfedges = triangulation.halfedges;
    const rowEnds = this.offsets;
    const onHull = this.onHull;
    for (let e = 0; e < 3 * triangulation.triangleCount; e++) {
      const from = triangles[e];
      rowEnds[from + 1]++;
      if (halfedges[e] < 0) {
        const to = triangles[e % 3 === 2 ? e - 2 : e + 1];
        rowEnds[to + 1]++;
        onHull[from] = 1;
        onHull[to] = 1;
      }
    }
  }

  /** Row starts from row lengths, and a copy of them as the fill cursors. */
  private accumulateOffsets(n: number): void {
    const offsets = this.offsets;
    const cursor = this.cursor;
    for (let k = 0; k < n; k++) {
      cursor[k] = offsets[k];
      offsets[k + 1] += offsets[k];
    }
  }

  private fillRows(triangulation: DelaunayTriangulation): void {
    const triangles = triangulation.triangles;
    const halfedges = triangulation.halfedges;
    const cursor = this.cursor;
    const neighbours = this.neighbours;
    for (let e = 0; e < 3 * triangulation.triangleCount; e++) {
      const from = triangles[e];
      const to = triangles[e % 3 === 2 ? e - 2 : e + 1];
      neighbours[cursor[from]++] = to;
      if (halfedges[e] < 0) neighbours[cursor[to]++] = from;
    }
  }
}
