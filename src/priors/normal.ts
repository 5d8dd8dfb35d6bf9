import type { Prior, PriorSpec } from './prior.js';
import { finiteField, positiveSigma, type PriorPlace } from './priorChecks.js';
import { LOG_SQRT_2PI, standardNormalQuantile } from '../numeric/special/standardNormal.js';

// Normal distribution N(mean, sigma^2): inverse CDF mean + sigma Phi^{-1}(u), Gaussian log density.
export function normalPrior(
  name: string, spec: Extract<PriorSpec, { kind: 'normal' }>, place: PriorPlace = {},
): Prior {
  const mean = finiteField(name, spec, 'mean', place);
  const sigma = positiveSigma(name, spec, place);
  const logNormaliser = Math.log(sigma) + LOG_SQRT_2PI;
  return Object.freeze({
    name,
    spec: Object.freeze({ kind: 'normal', mean, sigma } as const),
    isFixed: false,
    periodic: false,
    lower: -Infinity,
    upper: Infinity,
    fromUnit: (u: number): number => mean + sigma * standardNormalQuantile(u),
    logDensity: (x: number): number => {
      const z = (x - mean) / sigma;
      return -0.5 * z * z - logNormaliser;
    },
  });
}
