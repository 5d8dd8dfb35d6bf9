/**
 * Reorders items[from .. to - 1] so that items[k] is the one with the (k - from)-th smallest
 * key[item], none before it with a larger key and none after it with a smaller one: Hoare's
 * FIND (Hoare 1961, Commun. ACM 4, 321, Algorithm 65), with the median of the first, middle
 * and last keys as the bound. Expected time linear in the range; no allocation.
 */
export function selectByKey(items: Int32Array, from: number, to: number, k: number, key: ArrayLike<number>): void {
  let low = from;
  let high = to - 1;
  while (high > low) {
    const bound = medianOfThree(key[items[low]], key[items[(low + high) >> 1]], key[items[high]]);
    let i = low;
    let j = high;
    while (i <= j) {
      while (key[items[i]] < bound) i++;
      while (key[items[j]] > bound) j--;
      if (i <= j) {
        const swap = items[i];
        items[i++] = items[j];
        items[j--] = swap;
      }
    }
    if (k <= j) high = j;
    else if (k >= i) low = i;
    else return;
  }
}

function medianOfThree(a: number, b: number, c: number): number {
  if (a < b) return b < c ? b : a < c ? c : a;
  return a < c ? a : b < c ? c : b;
}
