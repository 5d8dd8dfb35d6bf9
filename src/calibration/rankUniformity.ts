import { chiSquareSurvival } from '../numeric/statistics/chiSquareSurvival.js';
import { kolmogorovSmirnovPValue, kolmogorovSmirnovUniform } from '../numeric/statistics/kolmogorovSmirnov.js';

/** How uniform one parameter's ranks and posterior CDF values are over the simulations. */
export interface RankUniformity {
  readonly draws: number;
  /** L: each rank is one of 0..L. */
  readonly rankDraws: number;
  /** Counts of ranks in `bins` equal bins of the L + 1 values. */
  readonly histogram: readonly number[];
  readonly chiSquare: number;
  readonly chiSquarePValue: number;
  readonly ksStatistic: number;
  readonly ksPValue: number;
}

/**
 * The number of rank bins: the largest of 20, 10, 5, 4, 2 that divides L + 1 (so every bin holds
 * as many rank values) and leaves at least 5 expected ranks per bin, the usual condition for the
 * chi-square approximation (Cochran 1952); 1 when none does.
 */
export function rankBinCount(draws: number, rankDraws: number): number {
  for (const bins of [20, 10, 5, 4, 2]) if ((rankDraws + 1) % bins === 0 && draws / bins >= 5) return bins;
  return 1;
}

// Uniformity of SBC ranks: Pearson's chi-square of the binned ranks against equal expected counts,
// bins - 1 degrees of freedom (Talts et al. 2018, section 4.1 bins the ranks; Pearson 1900), and
// the Kolmogorov-Smirnov test of the posterior CDF values against U(0, 1).
export function rankUniformity(ranks: readonly number[], cdfValues: readonly number[], rankDraws: number): RankUniformity {
  const draws = ranks.length;
  const bins = rankBinCount(draws, rankDraws);
  const perBin = (rankDraws + 1) / bins;
  const histogram = new Array<number>(bins).fill(0);
  for (const r of ranks) histogram[Math.min(bins - 1, Math.floor(r / perBin))]++;
  const expected = draws / bins;
  let chiSquare = 0;
  for (const observed of histogram) chiSquare += ((observed - expected) ** 2) / expected;
  const ks = draws === 0 ? 0 : kolmogorovSmirnovUniform(Float64Array.from(cdfValues));
  return {
    draws,
    rankDraws,
    histogram,
    chiSquare: bins > 1 ? chiSquare : 0,
    chiSquarePValue: bins > 1 ? chiSquareSurvival(chiSquare, bins - 1) : 1,
    ksStatistic: ks,
    ksPValue: draws === 0 ? 1 : kolmogorovSmirnovPValue(ks, draws),
  };
}
