// Sample quantile of ascending-sorted values by linear interpolation between order statistics
// (Hyndman & Fan 1996, definition 7).
export function quantileOfSorted(sorted: Float64Array, probability: number): number {
  const position = (sorted.length - 1) * probability;
  const below = Math.floor(position);
  const above = Math.min(sorted.length - 1, below + 1);
  return sorted[below] + (position - below) * (sorted[above] - sorted[below]);
}
