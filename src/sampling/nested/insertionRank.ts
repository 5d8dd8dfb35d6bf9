import { kolmogorovSmirnovPValue, kolmogorovSmirnovUniform } from '../../numeric/statistics/kolmogorovSmirnov.js';
import { SeededStream } from '../../numeric/random/seededStream.js';

/** Outcome of the insertion-rank check. */
export interface InsertionRankCheck {
  /** Kolmogorov-Smirnov p-value of the ranks against uniformity. */
  readonly pValue: number;
  /** pValue < 0.01: the constrained draws look biased (the caller should warn). */
  readonly biased: boolean;
  /** number of ranks tested. */
  readonly ranks: number;
  /** the Kolmogorov-Smirnov statistic D. */
  readonly statistic: number;
}

/** p-value below which a run is flagged as biased. */
export const insertionRankThreshold = 0.01;

/**
 * Insertion-rank test of Fowlie, Handley & Su 2020 ("nested sampling cross-checks using order
 * statistics"): a correctly drawn new live point falls uniformly among the m others, rank r in
 * 0..m. Each rank is mapped to u = (r + V)/(m + 1) with V uniform on [0, 1) (a randomised
 * probability integral transform, so u is exactly uniform under correct sampling even when m
 * varies), and the u are tested against U(0, 1) by Kolmogorov-Smirnov. `ranks[i]` lies in
 * 0..others[i]; the jitter stream is seeded by `seed`.
 */
export function insertionRankTest(
  ranks: ArrayLike<number>,
  others: ArrayLike<number>,
  count: number,
  seed: number,
): InsertionRankCheck {
  if (count === 0) return { pValue: 1, biased: false, ranks: 0, statistic: 0 };
  const stream = SeededStream.fromSeed(seed);
  const uniform = new Float64Array(count);
  for (let i = 0; i < count; i++) uniform[i] = (ranks[i] + stream.uniform()) / (others[i] + 1);
  const statistic = kolmogorovSmirnovUniform(uniform);
  const pValue = kolmogorovSmirnovPValue(statistic, count);
  return { pValue, biased: pValue < insertionRankThreshold, ranks: count, statistic };
}
