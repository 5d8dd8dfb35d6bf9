import { chainEffectiveSampleSize } from './chainEffectiveSampleSize.js';
import { firstAtLeast, rankNormalize } from './rankNormalize.js';
import { potentialScaleReduction } from './rHat.js';
import { quantileOfSorted } from '../../numeric/statistics/quantileOfSorted.js';
import { splitChains, type Draws } from './splitChains.js';

export interface ConvergenceSummary {
  /** Rank-normalised split R-hat: max of bulk and folded. */
  readonly rHat: number;
  readonly bulkEffectiveSampleSize: number;
  readonly tailEffectiveSampleSize: number;
}

// R-hat, bulk ESS and tail ESS of one quantity together (Vehtari, Gelman, Simpson, Carpenter &
// Buerkner 2021, sec. 4), sharing the split chains, their ranks and their sorted values; the same
// numbers as splitRHat, bulkEffectiveSampleSize and tailEffectiveSampleSize.
export function convergenceSummary(draws: Draws): ConvergenceSummary {
  const split = splitChains(draws);
  const sorted = split.values.slice().sort();
  const ranked = rankNormalize(split, sorted);
  const median = quantileOfSorted(sorted, 0.5);
  const folded = new Float64Array(split.values.length);
  for (let i = 0; i < folded.length; i++) folded[i] = Math.abs(split.values[i] - median);
  const rHat = Math.max(
    potentialScaleReduction(ranked),
    potentialScaleReduction(rankNormalize({ ...split, values: folded }, foldedSorted(sorted, median))),
  );
  let tail = Infinity;
  const indicator = new Float64Array(split.values.length);
  for (const probability of [0.05, 0.95]) {
    const q = quantileOfSorted(sorted, probability);
    for (let i = 0; i < indicator.length; i++) indicator[i] = split.values[i] <= q ? 1 : 0;
    tail = Math.min(tail, chainEffectiveSampleSize({ ...split, values: indicator }));
  }
  return { rHat, bulkEffectiveSampleSize: chainEffectiveSampleSize(ranked), tailEffectiveSampleSize: tail };
}

/** |x - median| of ascending values, in ascending order, by merging the two sides (no sort). */
function foldedSorted(sorted: Float64Array, median: number): Float64Array {
  const out = new Float64Array(sorted.length);
  let left = firstAtLeast(sorted, median) - 1;
  let right = left + 1;
  for (let k = 0; k < out.length; k++) {
    const below = left >= 0 ? median - sorted[left] : Infinity;
    const above = right < sorted.length ? sorted[right] - median : Infinity;
    if (below <= above) {
      out[k] = below;
      left--;
    } else {
      out[k] = above;
      right++;
    }
  }
  return out;
}
