import { chainMoments } from './chainMoments.js';
import { rankNormalize } from './rankNormalize.js';
import { quantileOfSorted } from '../../numeric/statistics/quantileOfSorted.js';
import { splitChains, type Draws } from './splitChains.js';

// Potential scale reduction R-hat = sqrt(var+ / W) (Gelman & Rubin 1992; BDA3 eq. 11.4).
export function potentialScaleReduction(draws: Draws): number {
  const { within, pooled } = chainMoments(draws);
  if (!(within > 0)) return Number.NaN;
  return Math.sqrt(pooled / within);
}

// Rank-normalised split R-hat (Vehtari, Gelman, Simpson, Carpenter & Buerkner 2021, sec. 4.2):
// the larger of R-hat on rank-normalised split chains (bulk) and on rank-normalised split chains
// of |theta - median| (folded, sensitive to differing scales).
export function splitRHat(draws: Draws): number {
  const split = splitChains(draws);
  const bulk = potentialScaleReduction(rankNormalize(split));
  const median = quantileOfSorted(split.values.slice().sort(), 0.5);
  const folded = new Float64Array(split.values.length);
  for (let i = 0; i < folded.length; i++) folded[i] = Math.abs(split.values[i] - median);
  const tail = potentialScaleReduction(rankNormalize({ ...split, values: folded }));
  return Math.max(bulk, tail);
}
