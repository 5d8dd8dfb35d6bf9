import { kishEffectiveSampleSize } from '../../numeric/statistics/kishEffectiveSampleSize.js';

/**
 * Weights e^{gamma t_i + b_i} (t the tempered log part, b a fixed log part or none; largest weight
 * 1, zero where t_i = -Infinity) with the largest gamma in [0, 1] whose Kish effective sample size
 * reaches `minimum` (gamma = 1 when the untempered weights do; else 40 bisections). Fitting a
 * proposal to tempered weights moves it only part of the way toward the target when the weights
 * are too uneven to trust, as tempered adaptive samplers do (Beskos, Jasra, Kantas & Thiery 2016,
 * Annals of Applied Probability 26, 1111: the next temperature chosen by effective sample size).
 * Importance weights temper t = ln w; a nested run's posterior, w = L dX, tempers t = ln L with
 * b = ln dX, giving the power posterior L^gamma pi.
 */
export function temperedWeights(
  tempered: ArrayLike<number>, fixed: ArrayLike<number> | null, count: number, minimum: number,
): { weights: Float64Array; gamma: number } {
  const weights = new Float64Array(count);
  const fill = (gamma: number): number => {
    let largest = -Infinity;
    for (let i = 0; i < count; i++) {
      const value = tempered[i] === -Infinity ? -Infinity : gamma * tempered[i] + (fixed === null ? 0 : fixed[i]);
      weights[i] = value;
      if (value > largest) largest = value;
    }
    for (let i = 0; i < count; i++) weights[i] = weights[i] === -Infinity ? 0 : Math.exp(weights[i] - largest);
    return kishEffectiveSampleSize(weights);
  };
  if (fill(1) >= minimum) return { weights, gamma: 1 };
  let low = 0;
  let high = 1;
  for (let iteration = 0; iteration < 40; iteration++) {
    const middle = 0.5 * (low + high);
    if (fill(middle) >= minimum) low = middle;
    else high = middle;
  }
  fill(low);
  return { weights, gamma: low };
}
