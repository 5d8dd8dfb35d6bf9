import { equalWeightResample } from '../../numeric/resampling/equalWeightResample.js';
import { weightsFromLogWeights } from '../../numeric/statistics/weightsFromLogWeights.js';
import { simulatedLnZSpread } from './evidenceError.js';
import { insertionRankTest } from './insertionRank.js';
import { logSumExp } from '../../numeric/statistics/logSumExp.js';
import type { NestedResult, NestedStopReason } from './nestedProblem.js';
import type { NestedState } from './nestedState.js';
import { derivedSeed } from '../../numeric/random/derivedSeed.js';
import { EarlyChains } from './earlyChains.js';
import { iterationsOf } from './liveSet.js';
import { importanceResultOf } from '../importance/importanceResult.js';

/** Simulated shrinkage sequences behind lnZErrorSimulated. */
export const shrinkageSimulations = 200;

/** Assembles the result: dead points, then the final live points at X_final / N each. */
export function nestedResultOf(state: NestedState, stopReason: NestedStopReason, early: EarlyChains | null): NestedResult {
  const { dim, physicalDim, livePoints, seed, method } = state.settings;
  const deadCount = iterationsOf(state);
  const count = deadCount + livePoints;
  const order = new Int32Array(livePoints);
  for (let i = 0; i < livePoints; i++) order[i] = i;
  order.sort((a, b) => state.liveLnL[a] - state.liveLnL[b] || a - b);
  const unitPoints = new Float64Array(count * dim);
  const points = new Float64Array(count * physicalDim);
  const lnL = new Float64Array(count);
  const lnX = new Float64Array(count);
  const lnWeight = new Float64Array(count);
  const liveCount = new Float64Array(count);
  unitPoints.set(state.deadUnit.view());
  points.set(state.deadPhysical.view());
  for (let i = 0; i < deadCount; i++) {
    lnL[i] = state.deadLnL.get(i);
    lnX[i] = state.deadLnX.get(i);
    lnWeight[i] = lnL[i] + state.deadLnSlice.get(i);
    liveCount[i] = state.deadLiveCount.get(i);
  }
  // The final live points share their cluster's remaining volume equally.
  const inCluster = new Int32Array(state.clusterLnX.length);
  for (let i = 0; i < livePoints; i++) inCluster[state.liveCluster[i]]++;
  for (let j = 0; j < livePoints; j++) {
    const slot = order[j];
    const row = deadCount + j;
    unitPoints.set(state.liveUnit.subarray(slot * dim, slot * dim + dim), row * dim);
    points.set(state.livePhysical.subarray(slot * physicalDim, slot * physicalDim + physicalDim), row * physicalDim);
    lnL[row] = state.liveLnL[slot];
    lnX[row] = state.lnX + Math.log((livePoints - j) / livePoints);
    const cluster = state.liveCluster[slot];
    lnWeight[row] = lnL[row] + state.clusterLnX[cluster] - Math.log(inCluster[cluster]);
    liveCount[row] = livePoints - j;
  }
  const lnZ = logSumExp(lnWeight);
  let information = 0;
  for (let i = 0; i < count; i++) {
    lnWeight[i] -= lnZ;
    const weight = Math.exp(lnWeight[i]);
    if (weight > 0) information += weight * lnL[i];
  }
  information -= lnZ;
  const finalLiveLnL = state.liveLnL.slice();
  const lnZErrorSimulated = simulatedLnZSpread(
    {
      deadLnL: state.deadLnL.view(),
      deadLiveCount: state.deadLiveCount.view(),
      deadCount,
      finalLiveLnL,
      initialFinite: state.initialFinite,
      initialDrawn: state.initialDrawn,
    },
    shrinkageSimulations,
    derivedSeed(seed, 1),
  );
  const insertionRank = insertionRankTest(state.rankValue.view(), state.rankOthers.view(), state.rankValue.count, derivedSeed(seed, 2));
  // Skilling 2006 sqrt(H/N), plus in quadrature the relative error sqrt((1 - f)/N) of the
  // negative-binomial estimate of the finite fraction f when initial draws were impossible.
  const nestedLnZError = Math.sqrt((Math.max(0, information) + (1 - Math.exp(state.lnXInitial))) / livePoints);
  const importance = state.importance?.complete === true ? importanceResultOf(state.importance, { lnZ, lnZError: nestedLnZError }) : null;
  return {
    lnZ: importance?.lnZ ?? lnZ,
    lnZError: importance?.lnZError ?? nestedLnZError,
    evidenceMethod: importance === null ? 'nested' : 'importance',
    nestedLnZ: lnZ,
    nestedLnZError,
    importance,
    lnZErrorSimulated,
    information,
    iterations: deadCount,
    evaluations: state.evaluations,
    efficiency: state.replacementEvaluations > 0 ? state.replacementsAccepted / state.replacementEvaluations : 1,
    chainParallelism: state.longestChainEvaluations > 0 ? state.chainEvaluations / state.longestChainEvaluations : 1,
    earlyChains: { used: early?.used ?? 0, discarded: early?.discarded ?? 0 },
    nonFiniteCount: state.nonFiniteCount,
    points,
    unitPoints,
    count,
    lnL,
    lnX,
    lnWeight,
    liveCount,
    insertionRanks: { rank: state.rankValue.view().slice(), others: state.rankOthers.view().slice() },
    insertionRank,
    method,
    stopReason,
    livePoints,
    equalWeight: (samples?: number, sampleSeed: number = derivedSeed(seed, 3)) =>
      equalWeightResample(points, physicalDim, weightsFromLogWeights(lnWeight), sampleSeed, samples).points,
  };
}
