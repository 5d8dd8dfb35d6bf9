import { expect } from 'vitest';
import { ensembleAutocorrelationTimes } from '../../src/sampling/diagnostics/index.js';
import type { EnsembleResult } from '../../src/sampling/ensemble/index.js';

/**
 * Mean of f over the retained part of an ensemble chain and its Monte-Carlo standard error
 * sqrt(tau_f var_f / (walkers x steps)), with tau_f the measured integrated autocorrelation time
 * of f itself (Sokal 1997; walkers treated as independent chains, the usual ensemble practice).
 * f reads one walker position at chain[offset .. offset + dim). tau is in stored steps.
 */
export function retainedMeanWithError(
  result: EnsembleResult, f: (chain: Float64Array, offset: number) => number,
): { mean: number; error: number; tau: number } {
  const { walkers, retainedFrom, dim } = result;
  const steps = result.steps - retainedFrom;
  const values = new Float64Array(steps * walkers);
  for (let i = 0; i < values.length; i++) values[i] = f(result.chain, (retainedFrom * walkers + i) * dim);
  let mean = 0;
  for (const v of values) mean += v;
  mean /= values.length;
  let variance = 0;
  for (const v of values) variance += (v - mean) ** 2;
  variance /= values.length - 1;
  const { tau, reliable } = ensembleAutocorrelationTimes(values, { steps, walkers, dim: 1 });
  expect(reliable).toBe(true);
  return { mean, error: Math.sqrt((tau[0] * variance) / values.length), tau: tau[0] };
}
