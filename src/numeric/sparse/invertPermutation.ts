/**
 * Copies `order` (order[k] = original index of row k of a permuted matrix) into ownOrder and
 * sets position[order[k]] = k; `position` must hold -1 in its first n entries. Returns the first
 * k where order is not a permutation of 0 .. n - 1 (an index out of range or repeated), or -1.
 */
export function invertPermutation(order: Int32Array, n: number, ownOrder: Int32Array, position: Int32Array): number {
  for (let k = 0; k < n; k++) {
    const v = order[k];
    if (!(v >= 0 && v < n) || position[v] >= 0) return k;
    position[v] = k;
    ownOrder[k] = v;
  }
  return -1;
}
