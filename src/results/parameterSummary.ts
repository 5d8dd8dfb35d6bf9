import type { CredibleInterval } from './credibleInterval.js';
import { weightedQuantiles } from './weightedQuantile.js';

/** Mass of the narrower central interval reported for every parameter. */
export const CREDIBLE_MASS_68 = 0.68;
/** Mass of the wider central interval reported for every parameter. */
export const CREDIBLE_MASS_95 = 0.95;

/** Median and the central 68% and 95% credible intervals of one parameter. */
export interface ParameterSummary {
  readonly median: number;
  readonly interval68: CredibleInterval;
  readonly interval95: CredibleInterval;
}

/**
 * Median and central 68% and 95% credible intervals (exactly 0.68 and 0.95 of the mass, not
 * 0.6827 and 0.9545) of weighted samples of one parameter, from one sort.
 */
export function parameterSummary(values: ArrayLike<number>, weights: ArrayLike<number>): ParameterSummary {
  const [low95, low68, median, high68, high95] = weightedQuantiles(values, weights, [
    (1 - CREDIBLE_MASS_95) / 2,
    (1 - CREDIBLE_MASS_68) / 2,
    0.5,
    (1 + CREDIBLE_MASS_68) / 2,
    (1 + CREDIBLE_MASS_95) / 2,
  ]);
  return { median, interval68: { lower: low68, upper: high68 }, interval95: { lower: low95, upper: high95 } };
}
