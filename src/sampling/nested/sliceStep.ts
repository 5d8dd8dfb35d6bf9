import { choleskyWithRidge } from '../../numeric/linearAlgebra/choleskyWithRidge.js';
import type { NestedProblem } from './nestedProblem.js';
import type { NestedState } from './nestedState.js';
import { sliceChainSeeds, type SliceChainRequest, type SliceSettings } from './sliceChain.js';
import { sliceChains } from './sliceChains.js';
import { chainStartSlots, EarlyChains, nextStepChains } from './earlyChains.js';
import { BatchEvaluator } from './batchEvaluator.js';
import { iterationsOf, absorbCounts, removeLowest, insertNewPoints, survivorRows } from './liveSet.js';

/** One step with k slice-sampling chains (run side by side) started from random surviving live points. */
export async function sliceStep(state: NestedState, evaluator: BatchEvaluator, problem: NestedProblem, early: EarlyChains | null): Promise<void> {
  const { dim, physicalDim, replacementsPerStep: k } = state.settings;
  const { slots, threshold } = removeLowest(state);
  const iterations = iterationsOf(state);
  // The chains use the whitening as it stood when the step began (built now only in the first
  // step); a rebuild due now is made from this step's survivors for the next step on. So the
  // next step's chains depend on nothing this step's chains produce except their end points,
  // which lets EarlyChains start them before this step ends.
  if (state.whitening === null) rebuildWhitening(state, iterations);
  const whitening = state.whitening!;
  if (iterations - state.whiteningBuiltAt >= state.settings.boundUpdateInterval) rebuildWhitening(state, iterations);
  const starts = chainStartSlots(state.liveLnL, k, state.stream);
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
      whitening,
      settings: sliceSettings,
    }));
    const results = early === null
      ? await Promise.all(requests.map((request) => problem.runSliceChain!(request)))
      : await early.runStep(state.steps, requests, (partial, pending) => nextStepChains({
        liveLnL: state.liveLnL, liveUnit: state.liveUnit, livePhysical: state.livePhysical, slots, stream: state.stream,
        whitening: state.whitening!, settings: sliceSettings,
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
      threshold, whitening, settings: sliceSettings, seeds: state.stream, evaluate: evaluator.evaluate,
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
  insertNewPoints(state, slots, newUnit, newPhysical, newLnL);
}

/** The whitening (liveCovarianceFactor) of the surviving live points, built at `iterations`. */
function rebuildWhitening(state: NestedState, iterations: number): void {
  const survivors = survivorRows(state);
  state.whitening = liveCovarianceFactor(survivors.rows, survivors.count, state.settings.dim);
  state.whiteningBuiltAt = iterations;
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

/** Lower Cholesky factor of the sample covariance of `count` rows (ridge-loaded if singular). */
function liveCovarianceFactor(rows: Float64Array, count: number, dim: number): Float64Array {
  const mean = new Float64Array(dim);
  for (let n = 0; n < count; n++) for (let i = 0; i < dim; i++) mean[i] += rows[n * dim + i] / count;
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
