import { ensureInt32Capacity } from './ensureCapacity.js';
import { runningSum } from './runningSum.js';
import type { SymmetricCsr } from './symmetricCsr.js';

/**
 * The graph of a symmetric sparse matrix: node v's neighbours (both triangles, diagonal left
 * out) are neighbour[start[v] .. start[v + 1] - 1]. Nodes with include[v] === 0 are left out
 * with all their edges, so that degrees are those of the graph of the included nodes. Buffers
 * are kept and grown across builds.
 */
export class SymmetricAdjacency {
  size = 0;
  start = new Int32Array(1);
  neighbour = new Int32Array(0);
  private next = new Int32Array(0);
  private endA = new Int32Array(0);
  private endB = new Int32Array(0);

  /** Rebuilds the graph of `matrix` restricted to the nodes with include[v] !== 0. */
  build(matrix: SymmetricCsr, include: Uint8Array): void {
    const n = matrix.size;
    const stored = matrix.rowStart[n];
    this.size = n;
    this.start = ensureInt32Capacity(this.start, n + 1);
    this.endA = ensureInt32Capacity(this.endA, stored);
    this.endB = ensureInt32Capacity(this.endB, stored);
    this.start.fill(0, 0, n + 1);
    const edges = collectEdges(matrix, include, this.endA, this.endB, this.start);
    runningSum(this.start, n);
    this.neighbour = ensureInt32Capacity(this.neighbour, 2 * edges);
    this.next = ensureInt32Capacity(this.next, this.start.length);
    this.next.set(this.start);
    fillNeighbours(this.endA, this.endB, edges, this.next, this.neighbour);
  }

  /** Number of neighbours of v among the included nodes. */
  degree(v: number): number {
    return this.start[v + 1] - this.start[v];
  }
}

/**
 * Lists the off-diagonal entries joining two included nodes as edges (endA[e], endB[e]) and
 * counts them at both ends in count[v + 1]; returns the number of edges.
 */
function collectEdges(matrix: SymmetricCsr, include: Uint8Array, endA: Int32Array, endB: Int32Array, count: Int32Array): number {
  const { rowStart, column } = matrix;
  let edges = 0;
  for (let i = 0; i < matrix.size; i++) {
    if (include[i] === 0) continue;
    for (let p = rowStart[i]; p < rowStart[i + 1]; p++) {
      const j = column[p];
      if (j === i || include[j] === 0) continue;
      count[i + 1]++;
      count[j + 1]++;
      endA[edges] = i;
      endB[edges++] = j;
    }
  }
  return edges;
}

/** Writes each edge into the lists of both its ends; next[v] is the next free slot of v. */
function fillNeighbours(endA: Int32Array, endB: Int32Array, edges: number, next: Int32Array, neighbour: Int32Array): void {
  for (let e = 0; e < edges; e++) {
    neighbour[next[endA[e]]++] = endB[e];
    neighbour[next[endB[e]]++] = endA[e];
  }
}
