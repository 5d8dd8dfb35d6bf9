import { InputError } from '../errors.js';
import type { ComponentConfig } from '../config/arcsiftConfig.js';

/** An allowed interval of a parameter; a bound is excluded when its flag says so. */
export interface ParameterRange {
  readonly lower: number;
  readonly upper: number;
  readonly lowerOpen?: boolean;
  readonly upperOpen?: boolean;
  /** What the range means, for the message (e.g. "an axis ratio 0 < q <= 1"). */
  readonly meaning: string;
}

function inside(range: ParameterRange, v: number): boolean {
  const aboveLower = range.lowerOpen === true ? v > range.lower : v >= range.lower;
  const belowUpper = range.upperOpen === true ? v < range.upper : v <= range.upper;
  return aboveLower && belowUpper;
}

/**
 * Insists that a component's parameter, its value and every value its prior can give, lies in the
 * range (a prior's bounds may touch an open end): a prior without bounds (normal) on a bounded
 * parameter is refused, with the advice to truncate it. Parameters the component does not give are not checked (their defaults are valid).
 */
export function checkParameterRange(component: ComponentConfig, name: string, range: ParameterRange, file: string): void {
  const entry = component.entries[name];
  if (entry === undefined) return;
  const fail = (found: string): never => {
    throw new InputError(`${name} must be ${range.meaning}; found ${found}`, { file, key: entry.key });
  };
  if (entry.value !== undefined && !inside(range, entry.value)) fail(String(entry.value));
  const prior = entry.prior;
  if (prior === undefined) return;
  if (prior.kind === 'normal') {
    if (Number.isFinite(range.lower) || Number.isFinite(range.upper)) fail('a normal prior, which reaches outside (use truncatedNormal)');
    return;
  }
  // The supports of uniform, logUniform, truncatedNormal and periodic priors are [lower, upper]; an
  // open end of the range may be a bound of the prior (it is drawn with probability zero).
  if (!(prior.lower >= range.lower && prior.upper <= range.upper)) fail(`a prior over [${prior.lower}, ${prior.upper}]`);
}
