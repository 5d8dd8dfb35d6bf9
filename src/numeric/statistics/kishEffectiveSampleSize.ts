/** Kish's effective sample size (sum w)^2 / sum w^2 of non-negative weights (Kish 1965). */
export function kishEffectiveSampleSize(weights: ArrayLike<number>): number {
  let sum = 0;
  let sumSquares = 0;
  for (let i = 0; i < weights.length; i++) {
    sum += weights[i];
    sumSquares += weights[i] * weights[i];
  }
  return sumSquares > 0 ? (sum * sum) / sumSquares : 0;
}
