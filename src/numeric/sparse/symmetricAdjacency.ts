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

  /** Rebuilds the graph of `matrix` restricted to the nodes with include[v] !== 0. */
  build(matrix: SymmetricCsr, include: Uint8Array): void {
    const n = matrix.size;
    this.size = n;
    this.start = ensureInt32Capacity(this.start, n + 1);
    this.start.fill(0, 0, n + 1);
    const edges = countEdges(matrix, include, this.start);
    runningSum(this.start, n);
    this.neighbour = ensureInt32Capacity(this.neighbour, 2 * edges);
    this.next = ensureInt32Capacity(this.next, this.start.length);
    this.next.set(this.start);
    fillNeighbours(matrix, include, this.next, this.neighbour);
  }

  /** Number of neighbours of v among the included nodes. */
  degree(v: number): number {
    return this.start[v + 1] - this.start[v];
  }
}

/**
 * Counts each off-diagonal entry joining two included nodes at both its ends, in count[v + 1];
 * returns the number of such edges.
 */
function countEdges(matrix: SymmetricCsr, include: Uint8Array, count: Int32Array): number {
  const { rowStart, column } = matrix;
  let edges = 0;
  for (let i = 0; i < matrix.size; i++) {
    if (include[i] === 0) continue;
    let own = 0;
    for (let p = rowStart[i]; p < rowStart[i + 1]; p++) {
      const j = column[p];
      if (j === i || include[j] === 0) continue;
      own++;
      count[j + 1]++;
    }
    count[i + 1] += own;
    edges += own;
  }
  return edges;
}

/** Writes each such edge into the lists of both its ends, straight from the matrix; next[v] is v's next free slot. */
function fillNeighbours(matrix: SymmetricCsr, include: Uint8Array, next: Int32Array, neighbour: Int32Array): void {
  const { rowStart, column } = matrix;
  for (let i = 0; i < matrix.size; i++) {
    if (include[i] === 0) continue;
    let at = next[i];
    for (let p = rowStart[i]; p < rowStart[i + 1]; p++) {
      const j = column[p];
      if (j === i || include[j] === 0) continue;
      neighbour[at++] = j;
      neighbour[next[j]++] = i;
    }
    next[i] = at;
  }
}
