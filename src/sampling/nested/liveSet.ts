import { InputError } from '../../errors.js';
import { logAddExp, logSumExp } from '../../numeric/statistics/logSumExp.js';
import type { NestedState } from './nestedState.js';
import { lnInitialVolume, removeFromCluster } from './shrinkage.js';
import { BatchEvaluator } from './batchEvaluator.js';
import { lowestSlots } from './lowestSlots.js';

export function iterationsOf(state: NestedState): number {
  return state.deadLnL.count;
}

/** Draws the initial live points from the whole cube, skipping impossible points (see lnInitialVolume). */
export async function drawInitialLivePoints(state: NestedState, evaluator: BatchEvaluator): Promise<void> {
  const { dim, physicalDim, livePoints } = state.settings;
  const unit = new Float64Array(livePoints * dim);
  const physical = new Float64Array(livePoints * physicalDim);
  let kept = 0;
  let drawn = 0;
  for (let batch = 0; kept < livePoints; batch++) {
    if (batch === 1000) {
      throw new InputError(`nested sampling logLikelihood: expected finite values somewhere in the prior, found only ${kept} in ${drawn} draws`);
    }
    for (let i = 0; i < livePoints * dim; i++) unit[i] = state.stream.uniform();
    const lnL = await evaluator.evaluate(unit, livePoints, physical);
    for (let row = 0; row < livePoints && kept < livePoints; row++) {
      drawn++;
      if (lnL[row] === -Infinity) continue;
      state.liveUnit.set(unit.subarray(row * dim, row * dim + dim), kept * dim);
      state.livePhysical.set(physical.subarray(row * physicalDim, row * physicalDim + physicalDim), kept * physicalDim);
      state.liveLnL[kept] = lnL[row];
      kept++;
    }
  }
  state.initialFinite = kept;
  state.initialDrawn = drawn;
  state.lnXInitial = lnInitialVolume(kept, drawn);
  state.lnX = state.lnXInitial;
  state.clusterLnX = Float64Array.of(state.lnXInitial);
  absorbCounts(state, evaluator);
}

export function absorbCounts(state: NestedState, evaluator: BatchEvaluator): number {
  const evaluations = evaluator.evaluations;
  state.evaluations += evaluations;
  state.nonFiniteCount += evaluator.nonFinite;
  evaluator.evaluations = 0;
  evaluator.nonFinite = 0;
  return evaluations;
}

export function maxLiveLnL(state: NestedState): number {
  let largest = -Infinity;
  for (let i = 0; i < state.liveLnL.length; i++) if (state.liveLnL[i] > largest) largest = state.liveLnL[i];
  return largest;
}

/**
 * Removes the k lowest live points into the dead list and returns their slots (ascending ln L)
 * and the new threshold. Each removed point shrinks its cluster's volume X_c by e^{-1/n_c}, n_c
 * the cluster's live points (Skilling 2006, Section 3; volumes per cluster as in Handley, Hobson &
 * Lasenby 2015, Section 3.3, so that any allocation of new points among clusters keeps the sum
 * right) and carries the slice X_c (1 - e^{-1/n_c}) into ln Z by the rectangle rule; a cluster's
 * last point carries all its remaining volume (removeFromCluster). The whole volume is the sum
 * over clusters.
 */
export function removeLowest(state: NestedState): { slots: Int32Array; threshold: number } {
  const { dim, physicalDim, replacementsPerStep: k } = state.settings;
  const lnL = state.liveLnL;
  const labels = state.liveCluster;
  const clusterLnX = state.clusterLnX;
  const slots = lowestSlots(lnL, k);
  const live = new Int32Array(clusterLnX.length);
  for (let i = 0; i < lnL.length; i++) live[labels[i]]++;
  for (let j = 0; j < k; j++) {
    const slot = slots[j];
    const cluster = labels[slot];
    const count = live[cluster];
    const lnSlice = removeFromCluster(clusterLnX, live, cluster);
    state.lnX = logSumExp(clusterLnX);
    state.lnZDead = logAddExp(state.lnZDead, lnL[slot] + lnSlice);
    state.deadUnit.push(state.liveUnit, slot * dim);
    state.deadPhysical.push(state.livePhysical, slot * physicalDim);
    state.deadLnL.pushValue(lnL[slot]);
    state.deadLnX.pushValue(state.lnX);
    state.deadLnSlice.pushValue(lnSlice);
    state.deadLiveCount.pushValue(count);
  }
  const threshold = lnL[slots[k - 1]];
  for (let j = 0; j < k; j++) lnL[slots[j]] = -Infinity;
  return { slots, threshold };
}

/**
 * Puts new points into the freed slots in order, recording each one's insertion rank; `labels`,
 * when given, are the new points' clusters.
 */
export function insertNewPoints(
  state: NestedState, slots: Int32Array, unit: Float64Array, physical: Float64Array, lnL: Float64Array, labels?: Int32Array,
): void {
  const { dim, physicalDim, livePoints } = state.settings;
  const live = state.liveLnL;
  for (let j = 0; j < slots.length; j++) {
    // Ranked among the live points of its own cluster (all of them without clusters).
    let rank = 0;
    let others = 0;
    for (let i = 0; i < livePoints; i++) {
      if (live[i] === -Infinity || (labels !== undefined && state.liveCluster[i] !== labels[j])) continue;
      others++;
      if (live[i] < lnL[j]) rank++;
    }
    state.rankValue.pushValue(rank);
    state.rankOthers.pushValue(others);
    const slot = slots[j];
    state.liveUnit.set(unit.subarray(j * dim, j * dim + dim), slot * dim);
    state.livePhysical.set(physical.subarray(j * physicalDim, j * physicalDim + physicalDim), slot * physicalDim);
    live[slot] = lnL[j];
    if (labels !== undefined) state.liveCluster[slot] = labels[j];
  }
  state.steps++;
}

/** Surviving live points (after removal) as contiguous rows, for bounds and covariances. */
export function survivorRows(state: NestedState): { rows: Float64Array; count: number; slots: Int32Array } {
  const { dim, livePoints } = state.settings;
  const slots = new Int32Array(livePoints);
  let count = 0;
  for (let i = 0; i < livePoints; i++) if (state.liveLnL[i] !== -Infinity) slots[count++] = i;
  const rows = new Float64Array(count * dim);
  for (let n = 0; n < count; n++) rows.set(state.liveUnit.subarray(slots[n] * dim, slots[n] * dim + dim), n * dim);
  return { rows, count, slots: slots.subarray(0, count) };
}
