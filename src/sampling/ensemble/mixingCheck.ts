import type { ChainLayout } from '../diagnostics/chainLayout.js';
import { parameterDraws } from '../diagnostics/chainLayout.js';
import { convergenceSummary } from '../diagnostics/convergenceSummary.js';
import type { EnsembleStopRule } from './ensembleOptions.js';

/** R-hat and effective sample sizes of every parameter over a chain's retained part (NaN when too short). */
export interface MixingDiagnostics {
  readonly rHat: Float64Array;
  readonly bulkEffectiveSampleSize: Float64Array;
  readonly tailEffectiveSampleSize: Float64Array;
}

/** The worst parameter's numbers at one check of the stop rule, and whether the rule was met. */
export interface MixingCheck {
  readonly smallestEffectiveSampleSize: number;
  readonly largestRHat: number;
  readonly met: boolean;
}

/** Fewest retained draws per walker for R-hat and ESS (split chains of two draws at least). */
const FEWEST_DRAWS = 4;

// Rank-normalised split R-hat, bulk and tail ESS of each parameter (Vehtari et al. 2021, sec. 4),
// walkers taken as chains, over the stored steps from `retainedFrom` on.
export function mixingDiagnostics(chain: Float64Array, layout: ChainLayout, retainedFrom: number): MixingDiagnostics {
  const { dim, walkers, steps } = layout;
  const n = steps - retainedFrom;
  const rHat = new Float64Array(dim).fill(Number.NaN);
  const bulk = new Float64Array(dim).fill(Number.NaN);
  const tail = new Float64Array(dim).fill(Number.NaN);
  if (n >= FEWEST_DRAWS) {
    const values = new Float64Array(walkers * n);
    for (let k = 0; k < dim; k++) {
      parameterDraws(chain, layout, k, retainedFrom, values);
      const summary = convergenceSummary({ values, chains: walkers, drawsPerChain: n });
      rHat[k] = summary.rHat;
      bulk[k] = summary.bulkEffectiveSampleSize;
      tail[k] = summary.tailEffectiveSampleSize;
    }
  }
  return { rHat, bulkEffectiveSampleSize: bulk, tailEffectiveSampleSize: tail };
}

/**
 * The stop rule (Vehtari et al. 2021, sec. 4, recommend R-hat < 1.01 and bulk and tail ESS >
 * 400): met when every parameter's R-hat is at most rule.maxRHat and both its ESS at least
 * rule.minEffectiveSampleSize. A NaN (too few draws) fails it.
 */
export function mixingCheck(diagnostics: MixingDiagnostics, rule: EnsembleStopRule): MixingCheck {
  let smallest = Infinity;
  let largest = -Infinity;
  for (let k = 0; k < diagnostics.rHat.length; k++) {
    smallest = Math.min(smallest, diagnostics.bulkEffectiveSampleSize[k], diagnostics.tailEffectiveSampleSize[k]);
    largest = Math.max(largest, diagnostics.rHat[k]);
  }
  return {
    smallestEffectiveSampleSize: smallest,
    largestRHat: largest,
    met: smallest >= rule.minEffectiveSampleSize && largest <= rule.maxRHat,
  };
}

/** Growth of the spacing of the checks once past ten intervals: a check costs time in proportion to the chain's length. */
const CHECK_GROWTH = 1.1;

/**
 * True when the stop rule is checked at `sweep`: every `every` sweeps up to 10 `every`, then at
 * multiples of `every` about 10% apart (c_next = every ceil(1.1 c / every)), so the checks of a
 * run of n sweeps cost about 11 times one check of the whole chain rather than n / (2 every)
 * times, and a run stops at most about 10% later than the first sweep that meets the rule.
 */
export function isCheckSweep(sweep: number, every: number): boolean {
  let check = every;
  while (check < sweep) check = every * Math.ceil((CHECK_GROWTH * check) / every);
  return check === sweep;
}
