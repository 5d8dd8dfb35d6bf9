import type { Draws } from './splitChains.js';

export interface ChainMoments {
  /** Mean of each chain. */
  readonly means: Float64Array;
  /** Within-chain variance W: the average of the chains' sample variances (n - 1 denominator). */
  readonly within: number;
  /** Between-chain variance over n, B / n: the sample variance of the chain means. */
  readonly betweenOverN: number;
  /** Pooled variance estimate var+ = (n - 1) / n W + B / n. */
  readonly pooled: number;
}

// Within- and between-chain variances and var+ (Gelman & Rubin 1992; Gelman et al. 2013, BDA3
// eq. 11.2-11.3).
export function chainMoments(draws: Draws): ChainMoments {
  const { values, chains, drawsPerChain: n } = draws;
  const means = new Float64Array(chains);
  let within = 0;
  for (let j = 0; j < chains; j++) {
    let mean = 0;
    for (let i = 0; i < n; i++) mean += values[j * n + i];
    mean /= n;
    let sumSquares = 0;
    for (let i = 0; i < n; i++) {
      const d = values[j * n + i] - mean;
      sumSquares += d * d;
    }
    means[j] = mean;
    within += sumSquares / (n - 1);
  }
  within /= chains;
  let grand = 0;
  for (let j = 0; j < chains; j++) grand += means[j];
  grand /= chains;
  let betweenOverN = 0;
  if (chains > 1) {
    for (let j = 0; j < chains; j++) betweenOverN += (means[j] - grand) ** 2;
    betweenOverN /= chains - 1;
  }
  return { means, within, betweenOverN, pooled: ((n - 1) / n) * within + betweenOverN };
}
