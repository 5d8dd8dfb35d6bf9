import { checkProbability, checkWeightedValues } from '../numeric/statistics/sampleChecks.js';

/**
 * Quantiles of weighted samples, all from one sort.
 *
 * Definition: the samples with positive weight are sorted by value; sample k (weight w_k, total W)
 * stands at the cumulative position c_k = (w_0 + ... + w_{k-1} + w_k / 2) / W, the middle of its
 * step of the weighted empirical distribution function, and the quantile at probability q is the
 * straight line through the points (c_k, x_k), held at x_0 below c_0 and at the largest value above
 * the last position. For equal weights c_k = (k + 1/2) / n: definition 5 of Hyndman & Fan 1996
 * (piecewise linear through the midpoints of the empirical distribution's steps), whose median is
 * the usual sample median. Zero weights carry no mass and are left out.
 */
export function weightedQuantiles(
  values: ArrayLike<number>,
  weights: ArrayLike<number>,
  probabilities: readonly number[],
): number[] {
  const total = checkWeightedValues(values, weights);
  for (const probability of probabilities) checkProbability(probability, 'quantile probability');
  const order: number[] = [];
  for (let i = 0; i < weights.length; i++) if (weights[i] > 0) order.push(i);
  order.sort((a, b) => values[a] - values[b]);
  const count = order.length;
  const sorted = new Float64Array(count);
  const position = new Float64Array(count);
  let below = 0;
  for (let k = 0; k < count; k++) {
    const weight = weights[order[k]];
    sorted[k] = values[order[k]];
    position[k] = (below + 0.5 * weight) / total;
    below += weight;
  }
  return probabilities.map((q) => interpolateAt(sorted, position, q));
}

/** One quantile of weighted samples (definition as in `weightedQuantiles`). */
export function weightedQuantile(values: ArrayLike<number>, weights: ArrayLike<number>, probability: number): number {
  return weightedQuantiles(values, weights, [probability])[0];
}

/** Value of the piecewise-linear curve through (position[k], sorted[k]) at q, by bisection. */
function interpolateAt(sorted: Float64Array, position: Float64Array, q: number): number {
  const last = sorted.length - 1;
  if (q <= position[0]) return sorted[0];
  if (q >= position[last]) return sorted[last];
  let low = 0;
  let high = last;
  while (high - low > 1) {
    const middle = (low + high) >>> 1;
    if (position[middle] <= q) low = middle;
    else high = middle;
  }
  const fraction = (q - position[low]) / (position[high] - position[low]);
  return sorted[low] + fraction * (sorted[high] - sorted[low]);
}
