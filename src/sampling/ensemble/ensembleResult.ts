import { parameterDraws, type ChainLayout } from '../diagnostics/chainLayout.js';
import { convergenceSummary } from '../diagnostics/convergenceSummary.js';
import { ensembleAutocorrelationTimes } from '../diagnostics/integratedAutocorrelationTime.js';

export interface EnsembleResult {
  /** Stored positions, steps x walkers x dim (row-major). */
  readonly chain: Float64Array;
  /** Stored log posterior values, steps x walkers. */
  readonly logPosterior: Float64Array;
  /** Stored steps (iterations / thin). */
  readonly steps: number;
  readonly walkers: number;
  readonly dim: number;
  readonly thin: number;
  /** Iterations run. */
  readonly iterations: number;
  /** First stored step used by the diagnostics (the burn-in before it is left out). */
  readonly retainedFrom: number;
  /** Accepted fraction of proposals per walker. */
  readonly acceptanceFraction: Float64Array;
  /** Integrated autocorrelation time per parameter, in iterations (stored steps x thin). */
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
  /** True when the autocorrelation stopping rule was met. */
  readonly converged: boolean;
  /** True when the run ended on a stop request before maxSteps or convergence. */
  readonly stopped: boolean;
}

/** The diagnostics of a stored chain over its retained part. */
export function chainDiagnostics(
  chain: Float64Array, layout: ChainLayout, retainedFrom: number, thin: number,
): Pick<EnsembleResult, 'autocorrelationTime' | 'autocorrelationReliable' | 'rHat' | 'effectiveSampleSize' | 'tailEffectiveSampleSize'> {
  const { dim, walkers, steps } = layout;
  const n = steps - retainedFrom;
  const rHat = new Float64Array(dim).fill(Number.NaN);
  const bulk = new Float64Array(dim).fill(Number.NaN);
  const tail = new Float64Array(dim).fill(Number.NaN);
  const { tau, reliable } = ensembleAutocorrelationTimes(chain, layout, retainedFrom);
  for (let k = 0; k < dim; k++) tau[k] *= thin;
  if (n >= 4) {
    const values = new Float64Array(walkers * n);
    for (let k = 0; k < dim; k++) {
      parameterDraws(chain, layout, k, retainedFrom, values);
      const summary = convergenceSummary({ values, chains: walkers, drawsPerChain: n });
      rHat[k] = summary.rHat;
      bulk[k] = summary.bulkEffectiveSampleSize;
      tail[k] = summary.tailEffectiveSampleSize;
    }
  }
  return {
    autocorrelationTime: tau, autocorrelationReliable: reliable, rHat, effectiveSampleSize: bulk,
    tailEffectiveSampleSize: tail,
  };
}
