/**
 * Levels of a selector field whose super-level sets hold given fractions of a separate weight:
 * points are sorted by `selector`, highest first, and their `weights` accumulated; the level for
 * mass m is the selector value at which the running weight first reaches m of the total. This is
 * the highest-density-region construction of densityLevels (common practice for corner plots)
 * with the region's shape set by one field (e.g. a smoothed density) and its mass counted in
 * another (the unsmoothed histogram). Returns one level per mass; NaN when the total weight is 0.
 */
export function enclosingLevels(selector: ArrayLike<number>, weights: ArrayLike<number>, masses: readonly number[]): number[] {
  const n = selector.length;
  const order = Uint32Array.from({ length: n }, (_, k) => k).sort((a, b) => selector[b] - selector[a]);
  const running = new Float64Array(n);
  let total = 0;
  for (let k = 0; k < n; k++) {
    total += weights[order[k]];
    running[k] = total;
  }
  return masses.map((mass) => {
    if (!(total > 0)) return NaN;
    const target = mass * total;
    let low = 0;
    let high = n - 1;
    while (low < high) {
      const middle = (low + high) >>> 1;
      if (running[middle] >= target) high = middle;
      else low = middle + 1;
    }
    return selector[order[low]];
  });
}
