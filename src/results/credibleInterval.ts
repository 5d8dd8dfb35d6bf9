import { checkProbability } from '../numeric/statistics/sampleChecks.js';
import { weightedQuantiles } from './weightedQuantile.js';

/** A central credible interval: equal posterior mass (1 - mass) / 2 below `lower` and above `upper`. */
export interface CredibleInterval {
  readonly lower: number;
  readonly upper: number;
}

/**
 * The central (equal-tailed) credible interval holding `mass` of the posterior, from the weighted
 * quantiles at (1 - mass) / 2 and (1 + mass) / 2 (definition in `weightedQuantiles`).
 */
export function credibleInterval(values: ArrayLike<number>, weights: ArrayLike<number>, mass: number): CredibleInterval {
  checkProbability(mass, 'credible interval mass');
  const [lower, upper] = weightedQuantiles(values, weights, [(1 - mass) / 2, (1 + mass) / 2]);
  return { lower, upper };
}
