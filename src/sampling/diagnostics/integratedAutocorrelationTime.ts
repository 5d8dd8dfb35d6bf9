import { averagedAutocorrelation } from './averagedAutocorrelation.js';
import { AutocovariancePlan } from './autocovariance.js';
import type { ChainLayout } from './chainLayout.js';

export interface AutocorrelationTimeEstimate {
  /** Integrated autocorrelation time tau = 1 + 2 sum_{t=1}^{M} rho(t), in steps of the series. */
  readonly tau: number;
  /** The window M chosen. */
  readonly window: number;
  /** False when no window M < n satisfied M >= c tau(M): the series is too short to trust tau. */
  readonly reliable: boolean;
}

// Integrated autocorrelation time with Sokal's automatic windowing (Sokal 1997, sec. 3): the smallest
// window M with M >= c tau(M), tau(M) = 1 + 2 sum_{t=1}^M rho(t) (twice Sokal's tau_int convention,
// so that the variance of a chain mean is tau var / n).
export function integratedAutocorrelationTime(
  rho: Float64Array, c = 5, length = rho.length,
): AutocorrelationTimeEstimate {
  if (!(length > 1) || !Number.isFinite(rho[0])) return { tau: Number.NaN, window: 0, reliable: false };
  let tau = 1;
  for (let m = 1; m < length; m++) {
    tau += 2 * rho[m];
    if (m >= c * tau) return { tau, window: m, reliable: true };
  }
  return { tau, window: length - 1, reliable: false };
}

export interface EnsembleAutocorrelationTimes {
  /** One tau per parameter, in steps of the chain as stored. */
  readonly tau: Float64Array;
  /** True when every parameter's window was found (see AutocorrelationTimeEstimate.reliable). */
  readonly reliable: boolean;
}

/** Sokal-windowed tau of every parameter of an ensemble chain, from the averaged autocorrelation. */
export function ensembleAutocorrelationTimes(
  chain: Float64Array, layout: ChainLayout, fromStep = 0, c = 5,
): EnsembleAutocorrelationTimes {
  const n = layout.steps - fromStep;
  const tau = new Float64Array(layout.dim).fill(Number.NaN);
  if (n < 2) return { tau, reliable: false };
  const plan = new AutocovariancePlan(n);
  const rho = new Float64Array(n);
  let reliable = true;
  for (let k = 0; k < layout.dim; k++) {
    averagedAutocorrelation(chain, layout, k, fromStep, rho, plan);
    const estimate = integratedAutocorrelationTime(rho, c, n);
    tau[k] = estimate.tau;
    reliable &&= estimate.reliable;
  }
  return { tau, reliable };
}
