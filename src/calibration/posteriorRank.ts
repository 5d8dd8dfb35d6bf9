import type { SeededStream } from '../numeric/random/seededStream.js';

/** A weighted posterior sample: `count` rows of `dim` values, row-major, weights summing to 1. */
export interface WeightedPosterior {
  readonly names: readonly string[];
  readonly dim: number;
  readonly count: number;
  readonly points: Float64Array;
  readonly weights: Float64Array;
}

/**
 * Indices of `draws` posterior draws, taken independently with probability equal to each
 * sample's weight (multinomial resampling: inverse CDF of the weights at uniform variates), so
 * that the draws are independent given the weighted sample, as the rank statistic assumes.
 */
export function posteriorDrawIndices(weights: Float64Array, draws: number, stream: SeededStream, out: Int32Array): Int32Array {
  const count = weights.length;
  const cumulative = new Float64Array(count);
  let sum = 0;
  for (let i = 0; i < count; i++) {
    sum += weights[i];
    cumulative[i] = sum;
  }
  for (let l = 0; l < draws; l++) {
    const u = stream.uniform() * sum;
    let low = 0;
    let high = count - 1;
    while (low < high) {
      const mid = (low + high) >> 1;
      if (cumulative[mid] <= u) low = mid + 1;
      else high = mid;
    }
    out[l] = low;
  }
  return out;
}

// Rank statistic of simulation-based calibration: the number of the L posterior draws below the
// true value, uniform on 0..L when the posterior is right (Talts et al. 2018, arXiv:1804.06788,
// Theorem 1 and Algorithm 1).
export function rankOfTruth(posterior: WeightedPosterior, column: number, indices: Int32Array, truth: number): number {
  let rank = 0;
  for (let l = 0; l < indices.length; l++) if (posterior.points[indices[l] * posterior.dim + column] < truth) rank++;
  return rank;
}

// The posterior CDF at the true value, sum of the weights of samples below it (half the weight of
// a tie): uniform on [0, 1] over simulations when the posterior is right (the probability
// integral transform; Cook, Gelman & Rubin 2006, JCGS 15, 675).
export function posteriorCdfAt(posterior: WeightedPosterior, column: number, truth: number): number {
  let below = 0;
  for (let i = 0; i < posterior.count; i++) {
    const v = posterior.points[i * posterior.dim + column];
    if (v < truth) below += posterior.weights[i];
    else if (v === truth) below += 0.5 * posterior.weights[i];
  }
  return below;
}
