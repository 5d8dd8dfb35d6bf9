import { choleskyWithRidge } from '../../numeric/linearAlgebra/choleskyWithRidge.js';
import type { SeededStream } from '../../numeric/random/seededStream.js';
import { bisectingClusters } from '../../numeric/clustering/bisectingClusters.js';
import type { NestedState } from './nestedState.js';
import { survivorRows } from './liveSet.js';
import { removeFromCluster } from './shrinkage.js';
import { logSumExp } from '../../numeric/statistics/logSumExp.js';
import { shrunkCovariance } from '../../numeric/statistics/shrunkCovariance.js';

/** Fewest live points a slice-sampling cluster may hold. */
export const minimumSliceClusterSize = 3;

/**
 * Each cluster's ln X after the k lowest live points leave (removeFromCluster, as removeLowest
 * does): `liveLnL` is -Infinity at the removed `slots` (ascending ln L), which are taken in order;
 * `clusterLnX` is updated in place.
 */
export function shrinkClusterVolumes(labels: Int32Array, liveLnL: Float64Array, slots: Int32Array, clusterLnX: Float64Array): void {
  const live = new Int32Array(clusterLnX.length);
  for (let i = 0; i < liveLnL.length; i++) if (liveLnL[i] !== -Infinity) live[labels[i]]++;
  for (const slot of slots) live[labels[slot]]++;
  for (const slot of slots) removeFromCluster(clusterLnX, live, labels[slot]);
}

/**
 * Slots of the start points of k slice chains. With one cluster, a surviving live point (finite
 * ln L, slot order) picked per chain by `stream.integer`. With C occupied clusters, each chain
 * first picks cluster c with probability (X_c / sum X + 1 / C) / 2, then one of its survivors.
 * With volumes kept per cluster (removeLowest) any allocation keeps ln Z right; half by volume
 * follows the prior, half evenly keeps a mode whose volume estimate has wandered low from dying
 * out: counted by live points alone, the clusters' numbers drift like a neutral population and
 * lose whole modes (measured: one of the two 20-dimensional Gaussian shells lost in most runs with
 * 50 live points). Allocating by cluster volume is the published choice (Handley et al. 2015,
 * MNRAS 453, 4384, Section 3.3, from memory); the even half is this sampler's own.
 */
export function chooseChainStarts(
  liveLnL: Float64Array, labels: Int32Array, clusterLnX: Float64Array, k: number, stream: SeededStream,
): Int32Array {
  const clusters = clusterLnX.length;
  const members: number[][] = Array.from({ length: clusters }, () => []);
  const survivors: number[] = [];
  for (let i = 0; i < liveLnL.length; i++) {
    if (liveLnL[i] === -Infinity) continue;
    survivors.push(i);
    members[labels[i]].push(i);
  }
  const starts = new Int32Array(k);
  const occupied = members.filter((m) => m.length > 0).length;
  if (occupied <= 1) {
    for (let chain = 0; chain < k; chain++) starts[chain] = survivors[stream.integer(survivors.length)];
    return starts;
  }
  let largest = -Infinity;
  for (let c = 0; c < clusters; c++) if (members[c].length > 0 && clusterLnX[c] > largest) largest = clusterLnX[c];
  const share = new Float64Array(clusters);
  let volume = 0;
  for (let c = 0; c < clusters; c++) {
    share[c] = members[c].length > 0 ? Math.exp(clusterLnX[c] - largest) : 0;
    volume += share[c];
  }
  let total = 0;
  for (let c = 0; c < clusters; c++) {
    share[c] = members[c].length > 0 ? 0.5 * (share[c] / volume + 1 / occupied) : 0;
    total += share[c];
  }
  for (let chain = 0; chain < k; chain++) {
    let pick = stream.uniform() * total;
    let chosen = -1;
    for (let c = 0; c < clusters; c++) {
      if (share[c] === 0) continue;
      chosen = c;
      pick -= share[c];
      if (pick < 0) break;
    }
    const list = members[chosen];
    starts[chain] = list[stream.integer(list.length)];
  }
  return starts;
}

/**
 * Re-clusters the surviving live points (bisectingClusters in the unit cube, clusters of at least
 * minimumSliceClusterSize), hands each old cluster's volume to the new clusters in proportion to
 * the survivors they take from it, and gives each new cluster the whitening (Cholesky factor of
 * the covariance) of its survivors: their sample covariance when they number at least 2 (d + 1),
 * else their covariance with shrunk correlations (shrunkCovariance), which stays positive definite
 * with fewer points than dimensions. Freed slots keep label -1 until filled.
 */
export function rebuildClusters(state: NestedState, iterations: number): void {
  const { dim } = state.settings;
  const survivors = survivorRows(state);
  const clustered = state.settings.sliceClusters;
  const clusters = clustered
    ? bisectingClusters(survivors.rows, survivors.count, dim, minimumSliceClusterSize)
    : { labels: new Int32Array(survivors.count), count: 1 };
  state.clusterLnX = inheritedVolumes(state.clusterLnX, state.liveCluster, survivors.slots, clusters.labels, clusters.count);
  state.liveCluster.fill(-1);
  for (let n = 0; n < survivors.count; n++) state.liveCluster[survivors.slots[n]] = clusters.labels[n];
  const whitenings: Float64Array[] = [];
  for (let c = 0; c < clusters.count; c++) {
    let count = 0;
    for (let n = 0; n < survivors.count; n++) if (clusters.labels[n] === c) count++;
    const rows = new Float64Array(count * dim);
    let m = 0;
    for (let n = 0; n < survivors.count; n++) {
      if (clusters.labels[n] === c) rows.set(survivors.rows.subarray(n * dim, n * dim + dim), dim * m++);
    }
    whitenings.push(liveCovarianceFactor(rows, count, dim, clustered));
  }
  state.whitenings = whitenings;
  state.whiteningBuiltAt = iterations;
}

/**
 * ln X of new clusters: each old cluster's volume shared among the new clusters in proportion to
 * the survivors they take from it; a new cluster made of one whole old cluster keeps its ln X as
 * it was (bit for bit, so that one cluster re-found stays exactly one cluster).
 */
function inheritedVolumes(
  oldLnX: Float64Array, oldLabels: Int32Array, slots: Int32Array, newLabels: Int32Array, newCount: number,
): Float64Array {
  const oldCount = new Int32Array(oldLnX.length);
  for (let n = 0; n < slots.length; n++) oldCount[oldLabels[slots[n]]]++;
  const taken = Array.from({ length: newCount }, () => new Map<number, number>());
  for (let n = 0; n < slots.length; n++) {
    const from = taken[newLabels[n]];
    const old = oldLabels[slots[n]];
    from.set(old, (from.get(old) ?? 0) + 1);
  }
  return Float64Array.from(taken, (from) => {
    const parts = [...from.entries()];
    if (parts.length === 1 && parts[0][1] === oldCount[parts[0][0]]) return oldLnX[parts[0][0]];
    return logSumExp(parts.map(([old, count]) => oldLnX[old] + Math.log(count / oldCount[old])));
  });
}

/**
 * Lower Cholesky factor of the covariance of `count` rows (ridge-loaded if singular; see
 * rebuildClusters); `shrinkSmall` false keeps the sample covariance always, as before clusters.
 */
function liveCovarianceFactor(rows: Float64Array, count: number, dim: number, shrinkSmall: boolean): Float64Array {
  const mean = new Float64Array(dim);
  for (let n = 0; n < count; n++) for (let i = 0; i < dim; i++) mean[i] += rows[n * dim + i] / count;
  if (shrinkSmall && count < 2 * (dim + 1)) {
    const shrunk = shrunkCovariance(rows, new Float64Array(count).fill(1), count, dim, mean, count);
    choleskyWithRidge(shrunk, dim, new Float64Array(dim * dim));
    return shrunk;
  }
  const covariance = new Float64Array(dim * dim);
  for (let n = 0; n < count; n++) {
    for (let i = 0; i < dim; i++) {
      const a = rows[n * dim + i] - mean[i];
      for (let j = 0; j <= i; j++) covariance[i * dim + j] += (a * (rows[n * dim + j] - mean[j])) / count;
    }
  }
  for (let i = 0; i < dim; i++) for (let j = 0; j < i; j++) covariance[j * dim + i] = covariance[i * dim + j];
  choleskyWithRidge(covariance, dim, new Float64Array(dim * dim));
  return covariance;
}
