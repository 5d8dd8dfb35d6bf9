import { checkProbability } from '../numeric/statistics/sampleChecks.js';
import { weightedQuantile } from './weightedQuantile.js';

/**
 * One-sided upper limit: the value below which `mass` (default 0.95) of the posterior lies, i.e.
 * the weighted quantile at `mass` (definition in `weightedQuantiles`).
 */
export function upperLimit(values: ArrayLike<number>, weights: ArrayLike<number>, mass = 0.95): number {
  checkProbability(mass, 'upper limit mass');
  return weightedQuantile(values, weights, mass);
}
