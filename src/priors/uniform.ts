import type { Prior, PriorSpec } from './prior.js';
import { orderedBounds, type PriorPlace } from './priorChecks.js';

type FlatSpec = Extract<PriorSpec, { kind: 'uniform' | 'periodic' }>;

// Uniform distribution on [lower, upper]: inverse CDF lower + u (upper - lower), density 1 / width.
export function uniformPrior(
  name: string, spec: Extract<PriorSpec, { kind: 'uniform' }>, place: PriorPlace = {},
): Prior {
  return flatPrior(name, spec, place);
}

/** The uniform density shared by the `uniform` and `periodic` kinds (periodic when kind says so). */
export function flatPrior(name: string, spec: FlatSpec, place: PriorPlace): Prior {
  const { lower, upper } = orderedBounds(name, spec, place);
  const width = upper - lower;
  const logDensityInside = -Math.log(width);
  return Object.freeze({
    name,
    spec: Object.freeze({ kind: spec.kind, lower, upper }),
    isFixed: false,
    periodic: spec.kind === 'periodic',
    lower,
    upper,
    fromUnit: (u: number): number => Math.min(upper, lower + u * width),
    logDensity: (x: number): number => (x >= lower && x <= upper ? logDensityInside : -Infinity),
  });
}
