import { logOneMinusExpNegative } from '../../numeric/statistics/logSumExp.js';

/**
 * Removes the lowest live point of `cluster`, which holds live[cluster] = n points, and returns
 * the ln of the prior-volume slice it carries into Z (Skilling 2006, Section 2, rectangle rule:
 * X (1 - e^{-1/n}); see lnVolumeSlice); the cluster's ln X then drops by 1/n, the expected ln of
 * the largest of n uniforms (Section 3; the order statistics t ~ Beta(n, 1) also give the j-th of k
 * points removed together, ln X_j = ln X_prev - sum_{l=0}^{j} 1/(n - l), as used for a varying
 * number of live points by Higson et al. 2019, "Dynamic nested sampling", Section 2). A cluster's
 * last point carries all its remaining volume, which becomes -Infinity. Updates clusterLnX and live.
 */
export function removeFromCluster(clusterLnX: Float64Array, live: Int32Array, cluster: number): number {
  const count = live[cluster];
  const lnSlice = count === 1 ? clusterLnX[cluster] : lnVolumeSlice(clusterLnX[cluster], count);
  clusterLnX[cluster] = count === 1 ? -Infinity : clusterLnX[cluster] - 1 / count;
  live[cluster] = count - 1;
  return lnSlice;
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
