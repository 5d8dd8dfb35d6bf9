import { InputError, expectedFound } from '../../errors.js';

/**
 * Checks shared by the posterior summaries: a weight array of non-negative finite numbers with a
 * positive sum, and values of the same length that are all finite. Returns the sum of weights.
 * `what` names the argument in the message (e.g. `weights of parameter thetaE`).
 */
export function checkWeightedValues(values: ArrayLike<number>, weights: ArrayLike<number>, what = 'samples'): number {
  if (values.length !== weights.length) {
    throw new InputError(`${what}: ${expectedFound(`${values.length} weights, one per value`, weights.length)}`);
  }
  let total = 0;
  for (let i = 0; i < weights.length; i++) {
    const weight = weights[i];
    if (!(weight >= 0) || weight === Infinity) {
      throw new InputError(`${what}: weight ${i}: ${expectedFound('a finite number >= 0', weight)}`);
    }
    if (!Number.isFinite(values[i])) {
      throw new InputError(`${what}: value ${i}: ${expectedFound('a finite number', values[i])}`);
    }
    total += weight;
  }
  if (!(total > 0) || total === Infinity) {
    throw new InputError(`${what}: ${expectedFound('weights with a positive finite sum', total)}`);
  }
  return total;
}

/** Checks that a probability (or enclosed mass) lies in [0, 1]. */
export function checkProbability(probability: number, what: string): void {
  if (!(probability >= 0 && probability <= 1)) {
    throw new InputError(`${what}: ${expectedFound('a number from 0 to 1', probability)}`);
  }
}

/** Checks that `points` holds `count` rows of `dim` values. */
export function checkRows(points: ArrayLike<number>, count: number, dim: number, what = 'points'): void {
  if (!Number.isInteger(dim) || dim < 1 || points.length !== count * dim) {
    throw new InputError(`${what}: ${expectedFound(`${count} rows of ${dim} values (${count * dim} numbers)`, points.length)}`);
  }
}
