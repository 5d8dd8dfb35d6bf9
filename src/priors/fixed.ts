import type { Prior, PriorSpec } from './prior.js';
import { finiteField, type PriorPlace } from './priorChecks.js';

// A parameter held at one value: a point mass (log density 0 at the value, -Infinity elsewhere).
export function fixedPrior(
  name: string, spec: Extract<PriorSpec, { kind: 'fixed' }>, place: PriorPlace = {},
): Prior {
  const value = finiteField(name, spec, 'value', place);
  return Object.freeze({
    name,
    spec: Object.freeze({ kind: 'fixed', value } as const),
    isFixed: true,
    periodic: false,
    lower: value,
    upper: value,
    fromUnit: (): number => value,
    logDensity: (x: number): number => (x === value ? 0 : -Infinity),
  });
}
