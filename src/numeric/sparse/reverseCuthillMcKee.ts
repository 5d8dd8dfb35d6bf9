import { ensureInt32Capacity } from './ensureCapacity.js';
import { pseudoPeripheralNode } from './pseudoPeripheralNode.js';
import { SymmetricAdjacency } from './symmetricAdjacency.js';
import type { SymmetricCsr } from './symmetricCsr.js';

const NONE: readonly number[] = [];

/**
 * Reverse Cuthill-McKee ordering of a symmetric sparse matrix (Cuthill & McKee 1969; reversed
 * as by George 1971; George & Liu 1981, chapter 4, subroutines GENRCM and RCM): each
 * connected component is numbered breadth-first from a pseudo-peripheral node, the unnumbered
 * neighbours of each node in increasing order of degree, and the component's numbering is
 * reversed. Indices listed in `last` (the dense rows of extra linear amplitudes, which join
 * everything and would make every level structure two levels deep) are left out of the graph
 * and placed at the end in the order given. Buffers are kept and grown across calls.
 */
export class ReverseCuthillMcKee {
  private readonly graph = new SymmetricAdjacency();
  private mask = new Uint8Array(0);
  private nodes = new Int32Array(0);
  private levelStart = new Int32Array(0);

  /**
   * Writes the ordering into order[0 .. n - 1]: order[k] is the original index of the k-th
   * row and column of the permuted matrix. Returns `order`.
   */
  order(matrix: SymmetricCsr, order: Int32Array, last: ArrayLike<number> = NONE): Int32Array {
    const n = matrix.size;
    if (order.length < n) throw new RangeError(`ordering buffer: expected room for ${n} indices, found ${order.length}`);
    if (this.mask.length < n) this.mask = new Uint8Array(Math.max(n, Math.ceil(this.mask.length * 1.5)));
    this.nodes = ensureInt32Capacity(this.nodes, n);
    this.levelStart = ensureInt32Capacity(this.levelStart, n + 1);
    const mask = this.mask;
    mask.fill(1, 0, n);
    markForcedLast(last, mask, n);
    this.graph.build(matrix, mask);
    const numbered = this.numberComponents(n, order);
    placeLast(last, order, numbered);
    return order;
  }

  /** Numbers every component of the included nodes; returns how many nodes were numbered. */
  private numberComponents(n: number, order: Int32Array): number {
    const { graph, mask, nodes, levelStart } = this;
    let numbered = 0;
    for (let v = 0; v < n; v++) {
      if (mask[v] === 0) continue;
      const root = pseudoPeripheralNode(graph, v, mask, nodes, levelStart);
      const count = cuthillMcKee(graph, root, mask, order, numbered);
      reverseRange(order, numbered, numbered + count);
      numbered += count;
    }
    return numbered;
  }
}

/** Clears mask on the indices of `last`; throws RangeError on one out of range or repeated. */
function markForcedLast(last: ArrayLike<number>, mask: Uint8Array, n: number): void {
  for (let t = 0; t < last.length; t++) {
    const v = last[t];
    if (!(Number.isInteger(v) && v >= 0 && v < n) || mask[v] === 0) {
      throw new RangeError(`indices to order last: entry ${t} (${v}) is out of range 0 .. ${n - 1} or repeated`);
    }
    mask[v] = 0;
  }
}

function reverseRange(a: Int32Array, from: number, to: number): void {
  for (let i = from, j = to - 1; i < j; i++, j--) {
    const swap = a[i];
    a[i] = a[j];
    a[j] = swap;
  }
}

function placeLast(last: ArrayLike<number>, order: Int32Array, from: number): void {
  for (let t = 0; t < last.length; t++) order[from + t] = last[t];
}

/**
 * Cuthill-McKee numbering of root's component into order[offset ..], clearing mask on the
 * nodes numbered; returns the component size.
 */
function cuthillMcKee(graph: SymmetricAdjacency, root: number, mask: Uint8Array, order: Int32Array, offset: number): number {
  mask[root] = 0;
  order[offset] = root;
  let end = offset + 1;
  for (let t = offset; t < end; t++) {
    const first = end;
    end = appendUnnumbered(graph, order[t], mask, order, end);
    sortByDegree(graph.start, order, first, end);
  }
  return end - offset;
}

/** Appends v's neighbours that still have mask set, clearing it; returns the new end. */
function appendUnnumbered(graph: SymmetricAdjacency, v: number, mask: Uint8Array, order: Int32Array, end: number): number {
  const { start, neighbour } = graph;
  for (let p = start[v]; p < start[v + 1]; p++) {
    const w = neighbour[p];
    if (mask[w] === 0) continue;
    mask[w] = 0;
    order[end++] = w;
  }
  return end;
}

/** Stable insertion sort of order[from .. to - 1] by increasing degree (the lists are short). */
function sortByDegree(start: Int32Array, order: Int32Array, from: number, to: number): void {
  for (let t = from + 1; t < to; t++) {
    const v = order[t];
    const degree = start[v + 1] - start[v];
    let s = t - 1;
    while (s >= from && start[order[s] + 1] - start[order[s]] > degree) {
      order[s + 1] = order[s];
      s--;
    }
    order[s + 1] = v;
  }
}
