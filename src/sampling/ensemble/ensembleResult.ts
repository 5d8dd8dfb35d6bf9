import type { ChainLayout } from '../diagnostics/chainLayout.js';
import { ensembleAutocorrelationTimes } from '../diagnostics/integratedAutocorrelationTime.js';
import { mixingDiagnostics } from './mixingCheck.js';

export interface EnsembleResult {
  /** Stored positions, steps x walkers x dim (row-major). */
  readonly chain: Float64Array;
  /** Stored log posterior values, steps x walkers. */
  readonly logPosterior: Float64Array;
  /** Stored steps (sweeps / thin). */
  readonly steps: number;
  readonly walkers: number;
  readonly dim: number;
  readonly thin: number;
  /** Sweeps run (each proposes a move to every walker once). */
  readonly sweeps: number;
  /** First stored step used by the diagnostics (the burn-in before it is left out). */
  readonly retainedFrom: number;
  /** Accepted fraction of proposals per walker. */
  readonly acceptanceFraction: Float64Array;
  /** Integrated autocorrelation time per parameter (Sokal's window), in sweeps (stored steps x thin). */
  readonly autocorrelationTime: Float64Array;
  /** False when some tau came from a series too short for Sokal's window rule. */
  readonly autocorrelationReliable: boolean;
  /** Rank-normalised split R-hat per parameter, walkers taken as chains. */
  readonly rHat: Float64Array;
  /** Bulk effective sample size per parameter (retained stored steps, walkers as chains). */
  readonly effectiveSampleSize: Float64Array;
  /** Tail effective sample size per parameter. */
  readonly tailEffectiveSampleSize: Float64Array;
  /** Log-density evaluations, start included. */
  readonly evaluations: number;
  /** Proposals whose log density was not finite (each counted as a rejection). */
  readonly nonFiniteProposals: number;
  /** True when the stop rule (R-hat and effective sample sizes) was met before maxSweeps. */
  readonly converged: boolean;
  /** True when the run ended on a stop request before maxSweeps or convergence. */
  readonly stopped: boolean;
}

/** The diagnostics of a stored chain over its retained part. */
export function chainDiagnostics(
  chain: Float64Array, layout: ChainLayout, retainedFrom: number, thin: number,
): Pick<EnsembleResult, 'autocorrelationTime' | 'autocorrelationReliable' | 'rHat' | 'effectiveSampleSize' | 'tailEffectiveSampleSize'> {
  const { tau, reliable } = ensembleAutocorrelationTimes(chain, layout, retainedFrom);
  for (let k = 0; k < layout.dim; k++) tau[k] *= thin;
  const mixing = mixingDiagnostics(chain, layout, retainedFrom);
  return {
    autocorrelationTime: tau, autocorrelationReliable: reliable, rHat: mixing.rHat,
    effectiveSampleSize: mixing.bulkEffectiveSampleSize, tailEffectiveSampleSize: mixing.tailEffectiveSampleSize,
  };
}
