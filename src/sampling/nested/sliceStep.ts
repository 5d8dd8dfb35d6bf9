import type { NestedProblem } from './nestedProblem.js';
import type { NestedState } from './nestedState.js';
import { sliceChainSeeds, type SliceChainRequest, type SliceSettings } from './sliceChain.js';
import { sliceChains } from './sliceChains.js';
import { EarlyChains, nextStepChains } from './earlyChains.js';
import { chooseChainStarts, rebuildClusters } from './liveClusters.js';
import { BatchEvaluator } from './batchEvaluator.js';
import { iterationsOf, absorbCounts, removeLowest, insertNewPoints } from './liveSet.js';

/**
 * One step with k slice-sampling chains (run side by side), each started from a surviving live
 * point of a cluster chosen in proportion to its volume (chooseChainStarts) and moving in that
 * cluster's whitened space.
 */
export async function sliceStep(state: NestedState, evaluator: BatchEvaluator, problem: NestedProblem, early: EarlyChains | null): Promise<void> {
  const { dim, physicalDim, replacementsPerStep: k } = state.settings;
  const { slots, threshold } = removeLowest(state);
  const iterations = iterationsOf(state);
  // The chains use the clusters and whitenings as they stood when the step began (built now only
  // in the first step); a rebuild due now is made from this step's survivors for the next step
  // on, and labels this step's new points by their start points. So the next step's chains
  // depend on nothing this step's chains produce except their end points, which lets
  // EarlyChains start them before this step ends.
  if (state.whitenings === null) rebuildClusters(state, iterations);
  const starts = chooseChainStarts(state.liveLnL, state.liveCluster, state.clusterLnX, k, state.stream);
  const whitenings = Array.from(starts, (slot) => state.whitenings![state.liveCluster[slot]]);
  if (iterations - state.whiteningBuiltAt >= state.settings.boundUpdateInterval) rebuildClusters(state, iterations);
  const newLabels = Int32Array.from(starts, (slot) => state.liveCluster[slot]);
  const startUnit = new Float64Array(k * dim);
  const startPhysical = new Float64Array(k * physicalDim);
  const startLnL = new Float64Array(k);
  for (let chain = 0; chain < k; chain++) {
    const slot = starts[chain];
    startUnit.set(state.liveUnit.subarray(slot * dim, slot * dim + dim), chain * dim);
    startPhysical.set(state.livePhysical.subarray(slot * physicalDim, slot * physicalDim + physicalDim), chain * physicalDim);
    startLnL[chain] = state.liveLnL[slot];
  }
  const newUnit = new Float64Array(k * dim);
  const newPhysical = new Float64Array(k * physicalDim);
  const newLnL = new Float64Array(k);
  const chainEvaluations = new Int32Array(k);
  const sliceSettings = sliceSettingsOf(state);
  let remoteEvaluations = 0;
  if (problem.runSliceChain !== undefined) {
    // Each chain runs where the likelihood is; the seeds are those sliceChains would draw.
    const seeds = sliceChainSeeds(state.stream, k);
    const requests: SliceChainRequest[] = seeds.map((seed, chain) => ({
      seed,
      startUnit: startUnit.slice(chain * dim, chain * dim + dim),
      startPhysical: startPhysical.slice(chain * physicalDim, chain * physicalDim + physicalDim),
      startLnL: startLnL[chain],
      threshold,
      whitening: whitenings[chain],
      settings: sliceSettings,
    }));
    const results = early === null
      ? await Promise.all(requests.map((request) => problem.runSliceChain!(request)))
      : await early.runStep(state.steps, requests, (partial, pending) => nextStepChains({
        liveLnL: state.liveLnL, liveUnit: state.liveUnit, livePhysical: state.livePhysical, slots, stream: state.stream,
        liveCluster: state.liveCluster, newLabels, clusterLnX: state.clusterLnX, whitenings: state.whitenings!, settings: sliceSettings,
      }, partial, pending));
    results.forEach((result, chain) => {
      newUnit.set(result.unit, chain * dim);
      newPhysical.set(result.physical, chain * physicalDim);
      newLnL[chain] = result.lnL;
      chainEvaluations[chain] = result.evaluations;
      remoteEvaluations += result.evaluations;
      state.nonFiniteCount += result.nonFinite;
    });
    state.evaluations += remoteEvaluations;
  } else {
    await sliceChains({
      chains: k,
      start: { unit: startUnit, physical: startPhysical, lnL: startLnL },
      threshold, whitening: whitenings, settings: sliceSettings, seeds: state.stream, evaluate: evaluator.evaluate,
      out: { unit: newUnit, physical: newPhysical, lnL: newLnL },
      chainEvaluations,
    });
  }
  let longest = 0;
  for (let chain = 0; chain < k; chain++) {
    state.chainEvaluations += chainEvaluations[chain];
    if (chainEvaluations[chain] > longest) longest = chainEvaluations[chain];
  }
  state.longestChainEvaluations += longest;
  state.replacementsAccepted += k;
  state.replacementEvaluations += absorbCounts(state, evaluator) + remoteEvaluations;
  insertNewPoints(state, slots, newUnit, newPhysical, newLnL, newLabels);
}

/** The slice settings of a run (the same every step). */
function sliceSettingsOf(state: NestedState): SliceSettings {
  const { dim, physicalDim } = state.settings;
  return {
    dim,
    physicalDim,
    steps: state.settings.sliceSteps,
    periodic: state.settings.periodic.some((flag) => flag) ? Uint8Array.from(state.settings.periodic, (flag) => (flag ? 1 : 0)) : null,
    widthScale: state.settings.sliceWidthScale,
    maxExpansions: 100,
    pointsPerChain: state.settings.slicePointsPerChain,
  };
}
