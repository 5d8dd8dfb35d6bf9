import { ensureFloat64Capacity } from './ensureCapacity.js';
import type { PlanePoints } from './nestedDissection.js';

/**
 * A profile ordering from the unknowns' plane coordinates alone: the points sorted by their
 * projection on the principal axis of their scatter (the eigenvector of the larger eigenvalue of
 * the 2 x 2 scatter matrix [[Sxx, Sxy], [Sxy, Syy]], at angle theta = atan2(2 Sxy, Sxx - Syy) / 2,
 * the closed form for a symmetric 2 x 2 matrix; common practice, and the test checks it against a
 * general eigen-decomposition), ties by index, then the indices of `last` in the order
 * given. Where the matrix couples each point to the points within some distance of it, as the
 * normal matrix of a source mesh does, the sweep keeps every coupling within a band whose width
 * is that distance across the point cloud, as a reverse Cuthill-McKee order does, without
 * reading the matrix. It depends on the coordinates only, so an ordering kept for a set of
 * points is the one a fresh call would make. Buffers are kept and grown across calls; no
 * allocation per call.
 */
export class PrincipalAxisOrder {
  private key = new Float64Array(0);

  /**
   * Writes the ordering into order[0 .. points.count + last.length - 1]: order[k] is the original
   * index of the k-th row and column of the permuted matrix; the points are indices
   * 0 .. points.count - 1 and `last` lists the others. Returns `order`.
   */
  order(points: PlanePoints, order: Int32Array, last: ArrayLike<number>): Int32Array {
    const m = points.count;
    if (order.length < m + last.length) throw new RangeError(`ordering buffer: expected room for ${m + last.length} indices, found ${order.length}`);
    this.key = ensureFloat64Capacity(this.key, m);
    const key = this.key;
    const { x, y } = points;
    let meanX = 0, meanY = 0;
    for (let v = 0; v < m; v++) {
      meanX += x[v];
      meanY += y[v];
    }
    meanX /= m;
    meanY /= m;
    let sxx = 0, syy = 0, sxy = 0;
    for (let v = 0; v < m; v++) {
      const dx = x[v] - meanX, dy = y[v] - meanY;
      sxx += dx * dx;
      syy += dy * dy;
      sxy += dx * dy;
    }
    const theta = 0.5 * Math.atan2(2 * sxy, sxx - syy);
    const ux = Math.cos(theta), uy = Math.sin(theta);
    for (let v = 0; v < m; v++) {
      key[v] = x[v] * ux + y[v] * uy;
      order[v] = v;
    }
    sortByKey(order, m, key);
    for (let t = 0; t < last.length; t++) order[m + t] = last[t];
    return order;
  }
}

/** Whether item a comes before item b: the smaller key, or on equal keys the smaller index. */
function before(a: number, b: number, key: Float64Array): boolean {
  const ka = key[a], kb = key[b];
  return ka < kb || (ka === kb && a < b);
}

/**
 * Sorts items[0 .. n - 1] by key[item], ties by item (a total order, so the result is unique):
 * heapsort (Williams 1964, Commun. ACM 7, 347, Algorithm 232), in place, n log n comparisons at
 * worst, no allocation.
 */
export function sortByKey(items: Int32Array, n: number, key: Float64Array): void {
  for (let root = (n >> 1) - 1; root >= 0; root--) siftDown(items, root, n, key);
  for (let end = n - 1; end > 0; end--) {
    const top = items[0];
    items[0] = items[end];
    items[end] = top;
    siftDown(items, 0, end, key);
  }
}

function siftDown(items: Int32Array, root: number, n: number, key: Float64Array): void {
  const item = items[root];
  let at = root;
  for (;;) {
    let child = 2 * at + 1;
    if (child >= n) break;
    if (child + 1 < n && before(items[child], items[child + 1], key)) child++;
    if (!before(item, items[child], key)) break;
    items[at] = items[child];
    at = child;
  }
  items[at] = item;
}
