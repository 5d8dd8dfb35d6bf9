import { paretoShapeLimit, paretoTailShape } from '../../numeric/statistics/paretoTailShape.js';

/** An importance-sampling estimate of ln Z and the diagnostics a reader needs to trust it. */
export interface ImportanceEstimate {
  /** ln of the mean weight, ln((1/n) sum_i w_i), over all n draws (zero weights included). */
  readonly lnZ: number;
  /** standard error of ln Z from the weights' sample variance (delta method). */
  readonly lnZError: number;
  /** draws n, and how many of them had a positive weight. */
  readonly draws: number;
  readonly positiveDraws: number;
  /** Kish effective sample size (sum w)^2 / sum w^2. */
  readonly effectiveSampleSize: number;
  /** the largest weight's share of the sum. */
  readonly largestWeightShare: number;
  /** Pareto k-hat of the weights' tail (NaN when too few positive weights) and its limit for n draws. */
  readonly paretoShape: number;
  readonly paretoShapeLimit: number;
}

/**
 * Plain importance sampling of Z = integral L pi (Kahn & Marshall 1953; Owen 2013, Monte Carlo
 * theory, methods and examples, Section 9.1, eq. 9.3 and 9.8): w_i = L(x_i) pi(x_i) / q(x_i) for
 * x_i drawn from q, Z-hat = mean w, Var Z-hat = s^2 / n with s^2 the weights' sample variance, and
 * the error of ln Z-hat its relative error sqrt(Var) / Z-hat (delta method). `lnWeights[0..count)`
 * are ln w_i, -Infinity for a zero weight. Diagnostics: Kish's effective sample size (Kish 1965),
 * the largest weight's share, and the Pareto k-hat of the tail (Vehtari et al. 2024).
 */
export function importanceEstimate(lnWeights: ArrayLike<number>, count: number = lnWeights.length): ImportanceEstimate {
  let largest = -Infinity;
  let positive = 0;
  for (let i = 0; i < count; i++) {
    if (lnWeights[i] > largest) largest = lnWeights[i];
    if (lnWeights[i] > -Infinity) positive++;
  }
  if (largest === -Infinity) {
    return {
      lnZ: -Infinity, lnZError: Infinity, draws: count, positiveDraws: 0, effectiveSampleSize: 0,
      largestWeightShare: Number.NaN, paretoShape: Number.NaN, paretoShapeLimit: paretoShapeLimit(count),
    };
  }
  let sum = 0;
  let sumSquares = 0;
  for (let i = 0; i < count; i++) {
    const w = Math.exp(lnWeights[i] - largest);
    sum += w;
    sumSquares += w * w;
  }
  const mean = sum / count;
  const variance = count > 1 ? Math.max(0, sumSquares - count * mean * mean) / (count - 1) : Infinity;
  return {
    lnZ: largest + Math.log(mean),
    lnZError: Math.sqrt(variance / count) / mean,
    draws: count,
    positiveDraws: positive,
    effectiveSampleSize: (sum * sum) / sumSquares,
    largestWeightShare: 1 / sum,
    paretoShape: paretoTailShape(lnWeights, count),
    paretoShapeLimit: paretoShapeLimit(count),
  };
}
