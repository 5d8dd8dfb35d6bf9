import type { Prior, PriorSpec } from './prior.js';
import { orderedBounds, priorError, type PriorPlace } from './priorChecks.js';

// Log-uniform (reciprocal) distribution on [lower, upper], 0 < lower: density 1 / (x ln(upper/lower)),
// inverse CDF lower (upper/lower)^u.
export function logUniformPrior(
  name: string, spec: Extract<PriorSpec, { kind: 'logUniform' }>, place: PriorPlace = {},
): Prior {
  const { lower, upper } = orderedBounds(name, spec, place);
  if (!(lower > 0)) {
    throw priorError(name, `expected 0 < lower < upper for a log-uniform prior, found lower = ${lower}`, place);
  }
  const logLower = Math.log(lower);
  const logRange = Math.log(upper) - logLower;
  const logNormaliser = Math.log(logRange);
  return Object.freeze({
    name,
    spec: Object.freeze({ kind: 'logUniform', lower, upper } as const),
    isFixed: false,
    periodic: false,
    lower,
    upper,
    fromUnit: (u: number): number => Math.min(upper, Math.max(lower, Math.exp(logLower + u * logRange))),
    logDensity: (x: number): number =>
      (x >= lower && x <= upper ? -Math.log(x) - logNormaliser : -Infinity),
  });
}
