import { ensureInt32Capacity } from './ensureCapacity.js';

const UNREACHED = 0x7fffffff;

/**
 * A minimum vertex cover of a bipartite graph: a maximum matching by Hopcroft & Karp (1973,
 * SIAM J. Comput. 2, 225), then the cover of König's theorem (König 1931): with Z the vertices
 * reached from the unmatched left vertices by alternating paths (left to right along any edge,
 * right to left along a matched one), the cover is (left \ Z) plus (right in Z), as large as the
 * matching. The graph: left vertex u's neighbours are the right vertices neighbour[start[u] ..
 * start[u + 1] - 1]. Buffers are kept and grown across calls.
 */
export class BipartiteVertexCover {
  private matchOfLeft = new Int32Array(0);
  private matchOfRight = new Int32Array(0);
  private layer = new Int32Array(0);
  private queue = new Int32Array(0);
  private nextEdge = new Int32Array(0);
  private reachedRight = new Int32Array(0);

  /**
   * Sets inCover[u] (left u, entries 0 .. leftCount - 1) and inCover[leftCount + v] (right v)
   * to 1 for the cover's vertices, 0 for the others; returns the cover's size.
   */
  cover(leftCount: number, rightCount: number, start: Int32Array, neighbour: Int32Array, inCover: Uint8Array): number {
    this.prepare(leftCount, rightCount);
    let matched = 0;
    while (this.layerFromFreeLeft(leftCount, start, neighbour)) matched += this.augmentAll(leftCount, start, neighbour);
    this.alternatingReach(leftCount, rightCount, start, neighbour);
    markCover(this.layer, this.reachedRight, leftCount, rightCount, inCover);
    return matched;
  }

  private prepare(leftCount: number, rightCount: number): void {
    this.matchOfLeft = ensureInt32Capacity(this.matchOfLeft, leftCount);
    this.matchOfRight = ensureInt32Capacity(this.matchOfRight, rightCount);
    this.layer = ensureInt32Capacity(this.layer, leftCount);
    this.queue = ensureInt32Capacity(this.queue, leftCount);
    this.nextEdge = ensureInt32Capacity(this.nextEdge, leftCount);
    this.reachedRight = ensureInt32Capacity(this.reachedRight, rightCount);
    this.matchOfLeft.fill(-1, 0, leftCount);
    this.matchOfRight.fill(-1, 0, rightCount);
  }

  /**
   * Breadth-first layers of the left vertices from the unmatched ones along alternating paths;
   * returns whether an unmatched right vertex is reached (an augmenting path exists).
   */
  private layerFromFreeLeft(leftCount: number, start: Int32Array, neighbour: Int32Array): boolean {
    const { layer, queue, matchOfLeft, matchOfRight } = this;
    let tail = 0;
    for (let u = 0; u < leftCount; u++) {
      layer[u] = matchOfLeft[u] < 0 ? 0 : UNREACHED;
      if (matchOfLeft[u] < 0) queue[tail++] = u;
    }
    let found = false;
    for (let head = 0; head < tail; head++) {
      const u = queue[head];
      for (let p = start[u]; p < start[u + 1]; p++) {
        const next = matchOfRight[neighbour[p]];
        if (next < 0) found = true;
        else if (layer[next] === UNREACHED) {
          layer[next] = layer[u] + 1;
          queue[tail++] = next;
        }
      }
    }
    return found;
  }

  /** One phase: vertex-disjoint shortest augmenting paths from every unmatched left vertex; returns how many. */
  private augmentAll(leftCount: number, start: Int32Array, neighbour: Int32Array): number {
    for (let u = 0; u < leftCount; u++) this.nextEdge[u] = start[u];
    let augmented = 0;
    for (let u = 0; u < leftCount; u++) if (this.matchOfLeft[u] < 0 && this.augment(u, start, neighbour)) augmented++;
    return augmented;
  }

  /** Depth-first search for an augmenting path from left u along the layers; flips it when found. */
  private augment(u: number, start: Int32Array, neighbour: Int32Array): boolean {
    const { layer, matchOfLeft, matchOfRight, nextEdge } = this;
    for (; nextEdge[u] < start[u + 1]; nextEdge[u]++) {
      const v = neighbour[nextEdge[u]];
      const next = matchOfRight[v];
      if (next < 0 || (layer[next] === layer[u] + 1 && this.augment(next, start, neighbour))) {
        matchOfLeft[u] = v;
        matchOfRight[v] = u;
        return true;
      }
    }
    layer[u] = UNREACHED;
    return false;
  }

  /** König's set Z: layer[u] = 0 for left vertices in Z (else 1), reachedRight[v] = 1 for right ones. */
  private alternatingReach(leftCount: number, rightCount: number, start: Int32Array, neighbour: Int32Array): void {
    const { layer, queue, matchOfLeft, matchOfRight, reachedRight } = this;
    reachedRight.fill(0, 0, rightCount);
    let tail = 0;
    for (let u = 0; u < leftCount; u++) {
      layer[u] = matchOfLeft[u] < 0 ? 0 : 1;
      if (matchOfLeft[u] < 0) queue[tail++] = u;
    }
    for (let head = 0; head < tail; head++) {
      const u = queue[head];
      for (let p = start[u]; p < start[u + 1]; p++) {
        const v = neighbour[p];
        if (reachedRight[v] === 1) continue;
        reachedRight[v] = 1;
        const next = matchOfRight[v];
        if (next >= 0 && layer[next] === 1) {
          layer[next] = 0;
          queue[tail++] = next;
        }
      }
    }
  }
}

function markCover(inZ: Int32Array, reachedRight: Int32Array, leftCount: number, rightCount: number, inCover: Uint8Array): void {
  for (let u = 0; u < leftCount; u++) inCover[u] = inZ[u] === 0 ? 0 : 1;
  for (let v = 0; v < rightCount; v++) inCover[leftCount + v] = reachedRight[v];
}
