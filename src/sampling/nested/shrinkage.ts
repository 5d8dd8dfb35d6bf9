import { logOneMinusExpNegative } from '../../numeric/statistics/logSumExp.js';

/**
 * Expected ln X of the k lowest of n live points removed together (Skilling 2006, Section 3; the
 * order statistics of n uniform variates, t_j ~ Beta(n - j, 1), as used for a varying number of
 * live points by Higson et al. 2019, "Dynamic nested sampling", Section 2): the j-th removed
 * (j = 0..k-1) has ln X_j = ln X_prev - sum_{l=0}^{j} 1/(n - l). Writes k values into `out`.
 */
export function batchLnVolumes(lnXPrevious: number, liveCount: number, removed: number, out: Float64Array): void {
  let lnX = lnXPrevious;
  for (let j = 0; j < removed; j++) {
    lnX -= 1 / (liveCount - j);
    out[j] = lnX;
  }
}

/**
 * ln of the prior-volume slice X_{j-1} - X_j = X_{j-1} (1 - e^{-1/(n - j)}) assigned to a dead
 * point by the rectangle rule (Skilling 2006, Section 2: Z = sum_i L_i (X_{i-1} - X_i)).
 */
export function lnVolumeSlice(lnXBefore: number, liveCountAtRemoval: number): number {
  return lnXBefore + logOneMinusExpNegative(1 / liveCountAtRemoval);
}

/**
 * ln X_0, the prior volume where the likelihood is finite, estimated from the initial draws: n
 * finite points needed `drawn` prior draws, a negative-binomial sample, whose unbiased estimate of
 * the finite fraction is (n - 1)/(drawn - 1) (Haldane 1945). Zero when no draw was rejected.
 */
export function lnInitialVolume(finite: number, drawn: number): number {
  return drawn > finite ? Math.log((finite - 1) / (drawn - 1)) : 0;
}
