import { BipartiteVertexCover } from './bipartiteVertexCover.js';
import { ensureInt32Capacity } from './ensureCapacity.js';
import { selectByKey } from './selectByKey.js';
import type { SymmetricAdjacency } from './symmetricAdjacency.js';

/**
 * One step of geometric nested dissection (George 1973, SIAM J. Numer. Anal. 10, 345; George &
 * Liu 1981, chapter 8) for nodes that all have plane coordinates (x, y): the nodes are cut at
 * the median of their wider extent into halves A and B, and the separator S is a minimum
 * vertex cover of the edges that join the two halves (BipartiteVertexCover, on the nodes of
 * each half with a neighbour in the other), so no edge joins A \ S and B \ S. The cover is never
 * larger than either half's boundary layer, and smaller where the coupling across the cut is
 * uneven. Buffers are kept and grown across calls.
 */
export class CoordinateBisection {
  private readonly vertexCover = new BipartiteVertexCover();
  private boundary = new Int32Array(0);
  private local = new Int32Array(0);
  private edgeStart = new Int32Array(1);
  private edgeEnd = new Int32Array(0);
  private inCover = new Uint8Array(0);

  /**
   * Labels nodes[from .. to - 1] (at least 2): label[v] = stamp (A), stamp + 1 (B) or stamp + 2
   * (S). Other nodes' labels must differ from these three. `nodes` is reordered within the range.
   */
  split(
    graph: SymmetricAdjacency, nodes: Int32Array, from: number, to: number,
    x: ArrayLike<number>, y: ArrayLike<number>, label: Int32Array, stamp: number,
  ): void {
    const size = to - from;
    this.boundary = ensureInt32Capacity(this.boundary, size);
    this.local = ensureInt32Capacity(this.local, graph.size);
    if (this.inCover.length < size) this.inCover = new Uint8Array(Math.max(size, Math.ceil(this.inCover.length * 1.5)));
    const middle = from + (size >> 1);
    selectByKey(nodes, from, to, middle, extent(nodes, from, to, x) >= extent(nodes, from, to, y) ? x : y);
    labelRange(nodes, from, middle, label, stamp);
    labelRange(nodes, middle, to, label, stamp + 1);
    const left = listBoundary(graph, nodes, from, middle, label, stamp + 1, this.boundary, 0, this.local);
    const right = listBoundary(graph, nodes, middle, to, label, stamp, this.boundary, left, this.local);
    this.crossingEdges(graph, left, label, stamp + 1);
    this.vertexCover.cover(left, right - left, this.edgeStart, this.edgeEnd, this.inCover);
    markCover(this.boundary, right, this.inCover, label, stamp + 2);
  }

  /** The edges from each left boundary node to the right boundary nodes, in compressed rows of right-local indices. */
  private crossingEdges(graph: SymmetricAdjacency, left: number, label: Int32Array, other: number): void {
    const { start } = graph;
    this.edgeStart = ensureInt32Capacity(this.edgeStart, left + 1);
    this.edgeStart[0] = 0;
    let count = 0;
    for (let u = 0; u < left; u++) {
      const v = this.boundary[u];
      this.edgeEnd = ensureInt32Capacity(this.edgeEnd, count + start[v + 1] - start[v]);
      count = appendCrossing(graph, v, label, other, this.local, left, this.edgeEnd, count);
      this.edgeStart[u + 1] = count;
    }
  }
}

/** max - min of the coordinate over the range. */
function extent(nodes: Int32Array, from: number, to: number, coordinate: ArrayLike<number>): number {
  let low = Number.POSITIVE_INFINITY;
  let high = Number.NEGATIVE_INFINITY;
  for (let t = from; t < to; t++) {
    const c = coordinate[nodes[t]];
    if (c < low) low = c;
    if (c > high) high = c;
  }
  return high - low;
}

function labelRange(nodes: Int32Array, from: number, to: number, label: Int32Array, value: number): void {
  for (let t = from; t < to; t++) label[nodes[t]] = value;
}

/** Whether v has a neighbour labelled `other`. */
function touches(graph: SymmetricAdjacency, v: number, label: Int32Array, other: number): boolean {
  const { start, neighbour } = graph;
  for (let p = start[v]; p < start[v + 1]; p++) if (label[neighbour[p]] === other) return true;
  return false;
}

/**
 * Appends to boundary[at ..] the nodes of the range with a neighbour labelled `other`, with
 * local[v] = their index in `boundary`; returns the new end.
 */
function listBoundary(
  graph: SymmetricAdjacency, nodes: Int32Array, from: number, to: number, label: Int32Array, other: number,
  boundary: Int32Array, at: number, local: Int32Array,
): number {
  let end = at;
  for (let t = from; t < to; t++) {
    const v = nodes[t];
    if (!touches(graph, v, label, other)) continue;
    local[v] = end;
    boundary[end++] = v;
  }
  return end;
}

/** Appends v's neighbours labelled `other` as right-local indices (local minus `left`); returns the new count. */
function appendCrossing(
  graph: SymmetricAdjacency, v: number, label: Int32Array, other: number, local: Int32Array, left: number, edgeEnd: Int32Array, count: number,
): number {
  const { start, neighbour } = graph;
  let end = count;
  for (let p = start[v]; p < start[v + 1]; p++) {
    const w = neighbour[p];
    if (label[w] === other) edgeEnd[end++] = local[w] - left;
  }
  return end;
}

/** Labels the covered boundary nodes as the separator. */
function markCover(boundary: Int32Array, count: number, inCover: Uint8Array, label: Int32Array, separator: number): void {
  for (let t = 0; t < count; t++) if (inCover[t] === 1) label[boundary[t]] = separator;
}
