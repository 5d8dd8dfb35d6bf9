import type { Prior, PriorSpec } from './prior.js';
import type { PriorPlace } from './priorChecks.js';
import { flatPrior } from './uniform.js';

// Uniform distribution on the circle [lower, upper) of period upper - lower (e.g. an angle).
export function periodicPrior(
  name: string, spec: Extract<PriorSpec, { kind: 'periodic' }>, place: PriorPlace = {},
): Prior {
  return flatPrior(name, spec, place);
}

/** Maps x onto [lower, lower + period) by whole periods. */
export function wrapIntoPeriod(x: number, lower: number, period: number): number {
  let shifted = (x - lower) % period;
  if (shifted < 0) shifted += period;
  // A tiny negative remainder plus the period can round up to the period itself.
  return shifted >= period ? lower : lower + shifted;
}
