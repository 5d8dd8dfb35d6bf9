import { InputError, expectedFound } from '../../errors.js';
import { readCheckpoint, writeCheckpoint } from './checkpoint.js';
import { choleskyWithRidge } from '../../numeric/linearAlgebra/choleskyWithRidge.js';
import { equalWeightResample } from '../../numeric/resampling/equalWeightResample.js';
import { weightsFromLogWeights } from '../../numeric/statistics/weightsFromLogWeights.js';
import { simulatedLnZSpread } from './evidenceError.js';
import { insertionRankTest } from './insertionRank.js';
import { logAddExp, logSumExp } from '../../numeric/statistics/logSumExp.js';
import { buildEllipsoidUnion, sampleFromUnion } from './multiEllipsoid.js';
import type {
  NestedMethod,
  NestedOptions,
  NestedProblem,
  NestedProgress,
  NestedResult,
  NestedStopReason,
} from './nestedProblem.js';
import { emptyState, recordState, restoreState } from './nestedState.js';
import type { NestedSettings, NestedState } from './nestedState.js';
import { derivedSeed } from '../../numeric/random/derivedSeed.js';
import { batchLnVolumes, lnInitialVolume, lnVolumeSlice } from './shrinkage.js';
import { sliceChainSeeds, sliceChains, type SliceChainRequest, type SliceSettings } from './sliceSampler.js';
import { chainStartSlots, EarlyChains, nextStepChains } from './earlyChains.js';
import { BatchEvaluator } from './batchEvaluator.js';
import { lowestSlots } from './lowestSlots.js';
import { runDefaults } from '../../settings/runDefaults.js';

/**
 * 'auto' uses ellipsoids up to this many dimensions and slice sampling above. From
 * `npm run bench -- samplers` (400 live points): on the Gaussian shells ellipsoids need 27x fewer
 * evaluations than slice sampling in 10 dimensions (55 k against 1.46 M) and still 8x fewer in 20
 * (0.79 M against 6.3 M), but on a curved 10-dimensional degeneracy (twisted Gaussian) they need
 * 9x more (15.9 M against 1.7 M), and their coverage rests on clusters of many more points than
 * dimensions, which grows harder above 10.
 */
export const autoEllipsoidMaxDim = 10;
/**
 * Default ellipsoid volume enlargement factor on top of each ellipsoid's bootstrap expansion. With
 * the bootstrap, 1 already gave unbiased ln Z on Gaussian shells (2, 5, 10 dimensions), a
 * 10-dimensional Gaussian and the egg-box (mean pull within 0.4 of zero over 6-20 seeds each).
 */
export const defaultEnlargement = 1;
/** Bootstrap resamples behind each ellipsoid's expansion (see bootstrapExpansion). */
export const ellipsoidBootstraps = 5;
/** Simulated shrinkage sequences behind lnZErrorSimulated. */
export const shrinkageSimulations = 200;

/**
 * Nested sampling (Skilling 2004, 2006) of a problem on the unit hypercube. Each step removes the k
 * lowest of N live points (expected ln X by order statistics, see batchLnVolumes), weights them
 * by the rectangle rule, and replaces them by k draws from the prior above the highest removed
 * likelihood: by rejection from a multi-ellipsoid bound (Feroz & Hobson 2008; Feroz, Hobson &
 * Bridges 2009) or by independent slice-sampling chains (Neal 2003; Handley, Hobson & Lasenby 2015).
 * The run stops when ln(Z + X_i max L_live) - ln Z < lnZTolerance (Skilling 2006); the final live
 * points are then added with X_final / N each. Ellipsoid candidates go to the likelihood in one call
 * per round; slice chains each send their own points and overlap, or run whole in worker threads,
 * where a thread freed during a step starts the next step's chains early (earlyChains.ts). No
 * random draw depends on timing, so (seed, k, and for slice sampling the points per chain s)
 * fixes the result.
 */
export async function runNested(problem: NestedProblem, options: NestedOptions = {}): Promise<NestedResult> {
  const settings = resolveSettings(problem, options);
  const tolerance = options.lnZTolerance ?? 0.1;
  if (!(tolerance > 0)) throw new InputError(`nested sampling lnZTolerance: ${expectedFound('a positive number', tolerance)}`);
  const checkpointPath = options.checkpoint?.path;
  if (options.resume === true && checkpointPath === undefined) {
    throw new InputError(`nested sampling resume: ${expectedFound('a checkpoint.path to resume from', undefined)}`);
  }
  const record = options.resume === true && checkpointPath !== undefined ? readCheckpoint(checkpointPath, settings) : null;
  const evaluator = new BatchEvaluator(problem);
  const early = problem.runSliceChain !== undefined && problem.idleThreads !== undefined
    ? new EarlyChains((request, stop) => problem.runSliceChain!(request, stop), () => problem.idleThreads!())
    : null;
  let state: NestedState;
  if (record !== null) {
    state = restoreState(record);
  } else {
    state = emptyState(settings);
    await drawInitialLivePoints(state, evaluator);
  }
  const started = Date.now();
  const elapsedAtStart = state.elapsedSeconds;
  const elapsed = () => elapsedAtStart + (Date.now() - started) / 1000;
  let lastCheckpointTime = Date.now();
  let lastCheckpointIteration = iterationsOf(state);
  let lastProgressBlock = Math.floor(iterationsOf(state) / settings.livePoints);
  const saveCheckpoint = () => {
    if (checkpointPath === undefined) return;
    state.elapsedSeconds = elapsed();
    writeCheckpoint(checkpointPath, recordState(state));
    lastCheckpointTime = Date.now();
    lastCheckpointIteration = iterationsOf(state);
  };
  const report = () => options.onProgress?.(progressOf(state, elapsed()));

  let stopReason: NestedStopReason;
  for (;;) {
    const reason = stopReasonOf(state, options, tolerance);
    if (reason !== null) {
      stopReason = reason;
      break;
    }
    if (settings.method === 'ellipsoids') await ellipsoidStep(state, evaluator);
    else await sliceStep(state, evaluator, problem, early);
    const iterations = iterationsOf(state);
    const block = Math.floor(iterations / settings.livePoints);
    if (block > lastProgressBlock) {
      lastProgressBlock = block;
      report();
    }
    const checkpoint = options.checkpoint;
    if (
      checkpoint !== undefined &&
      ((checkpoint.everyIterations !== undefined && iterations - lastCheckpointIteration >= checkpoint.everyIterations) ||
        (checkpoint.everySeconds !== undefined && Date.now() - lastCheckpointTime >= checkpoint.everySeconds * 1000))
    ) {
      saveCheckpoint();
    }
  }
  saveCheckpoint();
  report();
  return finishedResult(state, stopReason, early);
}

function iterationsOf(state: NestedState): number {
  return state.deadLnL.count;
}

function positiveInteger(value: number | undefined, fallback: number, key: string, minimum = 1): number {
  if (value === undefined) return fallback;
  if (!Number.isInteger(value) || value < minimum) {
    throw new InputError(`nested sampling ${key}: ${expectedFound(`an integer >= ${minimum}`, value)}`);
  }
  return value;
}

function resolveSettings(problem: NestedProblem, options: NestedOptions): NestedSettings {
  const dim = positiveInteger(problem.dim, 0, 'problem.dim');
  const physicalDim = positiveInteger(problem.physicalDim, 0, 'problem.physicalDim');
  const livePoints = positiveInteger(options.livePoints, runDefaults.nested.livePoints, 'livePoints', 2);
  const seed = positiveInteger(options.seed, 1, 'seed');
  if (seed > 0xffffffff) throw new InputError(`nested sampling seed: ${expectedFound('an integer from 1 to 4294967295', seed)}`);
  const replacementsPerStep = positiveInteger(options.replacementsPerStep, 1, 'replacementsPerStep');
  if (replacementsPerStep >= livePoints) {
    throw new InputError(`nested sampling replacementsPerStep: ${expectedFound(`fewer than livePoints (${livePoints})`, replacementsPerStep)}`);
  }
  const requested: NestedMethod = options.method ?? 'auto';
  if (requested !== 'auto' && requested !== 'ellipsoids' && requested !== 'slice') {
    throw new InputError(`nested sampling method: ${expectedFound('"auto", "ellipsoids" or "slice"', requested)}`);
  }
  const method = requested === 'auto' ? (dim <= autoEllipsoidMaxDim ? 'ellipsoids' : 'slice') : requested;
  const enlargement = options.enlargement ?? defaultEnlargement;
  if (!(enlargement >= 1) || !Number.isFinite(enlargement)) {
    throw new InputError(`nested sampling enlargement: ${expectedFound('a finite number >= 1', enlargement)}`);
  }
  const sliceSteps = positiveInteger(options.slice?.steps, 5 * dim, 'slice.steps');
  const slicePointsPerChain = positiveInteger(options.slice?.pointsPerChain, 1, 'slice.pointsPerChain');
  const periodic = problem.periodic === undefined ? new Array<boolean>(dim).fill(false) : Array.from(problem.periodic);
  if (periodic.length !== dim) {
    throw new InputError(`nested sampling problem.periodic: ${expectedFound(`a list of ${dim} booleans`, problem.periodic)}`);
  }
  const boundVolumeFactorForTesting = options.boundVolumeFactorForTesting ?? 1;
  if (!(boundVolumeFactorForTesting > 0)) {
    throw new InputError(`nested sampling boundVolumeFactorForTesting: ${expectedFound('a positive number', boundVolumeFactorForTesting)}`);
  }
  return {
    dim,
    physicalDim,
    livePoints,
    seed,
    method,
    replacementsPerStep,
    enlargement,
    minimumClusterSize: dim + 1,
    bootstraps: ellipsoidBootstraps,
    boundUpdateInterval: Math.max(1, Math.round(livePoints / 10)),
    sliceSteps,
    slicePointsPerChain,
    sliceWidthScale: Math.sqrt(dim + 2),
    periodic,
    boundVolumeFactorForTesting,
  };
}

/** Draws the initial live points from the whole cube, skipping impossible points (see lnInitialVolume). */
async function drawInitialLivePoints(state: NestedState, evaluator: BatchEvaluator): Promise<void> {
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
  absorbCounts(state, evaluator);
}

function absorbCounts(state: NestedState, evaluator: BatchEvaluator): number {
  const evaluations = evaluator.evaluations;
  state.evaluations += evaluations;
  state.nonFiniteCount += evaluator.nonFinite;
  evaluator.evaluations = 0;
  evaluator.nonFinite = 0;
  return evaluations;
}

function maxLiveLnL(state: NestedState): number {
  let largest = -Infinity;
  for (let i = 0; i < state.liveLnL.length; i++) if (state.liveLnL[i] > largest) largest = state.liveLnL[i];
  return largest;
}

function stopReasonOf(state: NestedState, options: NestedOptions, tolerance: number): NestedStopReason | null {
  if (options.signal?.stopRequested === true) return 'interrupted';
  if (state.lnZDead > -Infinity) {
    const remaining = state.lnX + maxLiveLnL(state);
    if (logAddExp(state.lnZDead, remaining) - state.lnZDead < tolerance) return 'converged';
  }
  if (options.maxIterations !== undefined && iterationsOf(state) >= options.maxIterations) return 'maxIterations';
  if (options.maxEvaluations !== undefined && state.evaluations >= options.maxEvaluations) return 'maxEvaluations';
  return null;
}

function progressOf(state: NestedState, elapsedSeconds: number): NestedProgress {
  return {
    iteration: iterationsOf(state),
    lnZ: state.lnZDead,
    lnZRemaining: state.lnX + maxLiveLnL(state),
    efficiency: state.replacementEvaluations > 0 ? state.replacementsAccepted / state.replacementEvaluations : 1,
    evaluations: state.evaluations,
    elapsedSeconds,
  };
}

/**
 * Removes the k lowest live points into the dead list (ln X by batchLnVolumes, rectangle-rule
 * weights into the running ln Z) and returns their slots (ascending ln L) and the new threshold.
 */
function removeLowest(state: NestedState): { slots: Int32Array; threshold: number } {
  const { dim, physicalDim, livePoints, replacementsPerStep: k } = state.settings;
  const lnL = state.liveLnL;
  const slots = lowestSlots(lnL, k);
  const lnXAfter = new Float64Array(k);
  batchLnVolumes(state.lnX, livePoints, k, lnXAfter);
  let lnXBefore = state.lnX;
  for (let j = 0; j < k; j++) {
    const slot = slots[j];
    const liveCount = livePoints - j;
    state.lnZDead = logAddExp(state.lnZDead, lnL[slot] + lnVolumeSlice(lnXBefore, liveCount));
    state.deadUnit.push(state.liveUnit, slot * dim);
    state.deadPhysical.push(state.livePhysical, slot * physicalDim);
    state.deadLnL.pushValue(lnL[slot]);
    state.deadLnX.pushValue(lnXAfter[j]);
    state.deadLiveCount.pushValue(liveCount);
    lnXBefore = lnXAfter[j];
  }
  state.lnX = lnXAfter[k - 1];
  const threshold = lnL[slots[k - 1]];
  for (let j = 0; j < k; j++) lnL[slots[j]] = -Infinity;
  return { slots, threshold };
}

/** Puts new points into the freed slots in order, recording each one's insertion rank. */
function insertNewPoints(state: NestedState, slots: Int32Array, unit: Float64Array, physical: Float64Array, lnL: Float64Array): void {
  const { dim, physicalDim, livePoints } = state.settings;
  const live = state.liveLnL;
  let others = livePoints - slots.length;
  for (let j = 0; j < slots.length; j++) {
    let rank = 0;
    for (let i = 0; i < livePoints; i++) if (live[i] !== -Infinity && live[i] < lnL[j]) rank++;
    state.rankValue.pushValue(rank);
    state.rankOthers.pushValue(others);
    const slot = slots[j];
    state.liveUnit.set(unit.subarray(j * dim, j * dim + dim), slot * dim);
    state.livePhysical.set(physical.subarray(j * physicalDim, j * physicalDim + physicalDim), slot * physicalDim);
    live[slot] = lnL[j];
    others++;
  }
  state.steps++;
}

/** Surviving live points (after removal) as contiguous rows, for bounds and covariances. */
function survivorRows(state: NestedState): { rows: Float64Array; count: number; slots: Int32Array } {
  const { dim, livePoints } = state.settings;
  const slots = new Int32Array(livePoints);
  let count = 0;
  for (let i = 0; i < livePoints; i++) if (state.liveLnL[i] !== -Infinity) slots[count++] = i;
  const rows = new Float64Array(count * dim);
  for (let n = 0; n < count; n++) rows.set(state.liveUnit.subarray(slots[n] * dim, slots[n] * dim + dim), n * dim);
  return { rows, count, slots: slots.subarray(0, count) };
}

/** Largest ellipsoid-method batch, in candidates per likelihood call. */
const maxBatch = 8192;
/** Evaluations over which the acceptance estimate decays by e. */
const efficiencyMemory = 2000;

/** One step with candidates drawn by rejection from the multi-ellipsoid bound (or the whole cube). */
async function ellipsoidStep(state: NestedState, evaluator: BatchEvaluator): Promise<void> {
  const { dim, physicalDim, livePoints, replacementsPerStep: k } = state.settings;
  const { slots, threshold } = removeLowest(state);
  const iterations = iterationsOf(state);
  if (iterations - state.boundBuiltAt >= state.settings.boundUpdateInterval) {
    const survivors = survivorRows(state);
    const union = buildEllipsoidUnion(survivors.rows, dim, survivors.count, state.lnX, {
      enlargement: state.settings.enlargement,
      minimumClusterSize: state.settings.minimumClusterSize,
      bootstraps: state.settings.bootstraps,
      volumeFactorForTesting: state.settings.boundVolumeFactorForTesting,
    }, state.stream);
    state.bound = union.lnVolumeSum >= 0 && state.settings.boundVolumeFactorForTesting === 1 ? null : union;
    state.boundBuiltAt = iterations;
  }
  const newUnit = new Float64Array(k * dim);
  const newPhysical = new Float64Array(k * physicalDim);
  const newLnL = new Float64Array(k);
  let accepted = 0;
  // Spare candidates from earlier batches come first, in draw order, if still above the threshold.
  const spareCount = state.spareLnL.count;
  let spareUsed = 0;
  while (spareUsed < spareCount && accepted < k) {
    if (state.spareLnL.get(spareUsed) > threshold) {
      for (let i = 0; i < dim; i++) newUnit[accepted * dim + i] = state.spareUnit.get(spareUsed, i);
      for (let i = 0; i < physicalDim; i++) newPhysical[accepted * physicalDim + i] = state.sparePhysical.get(spareUsed, i);
      newLnL[accepted] = state.spareLnL.get(spareUsed);
      accepted++;
    }
    spareUsed++;
  }
  state.spareUnit.dropFirst(spareUsed);
  state.sparePhysical.dropFirst(spareUsed);
  state.spareLnL.dropFirst(spareUsed);
  const scratch = new Float64Array(dim);
  const candidate = new Float64Array(dim);
  while (accepted < k) {
    const needed = k - accepted;
    const efficiency = state.recentValid / state.recentEvaluated;
    const batch = Math.min(maxBatch, Math.max(needed, Math.ceil(needed / efficiency)));
    const unit = new Float64Array(batch * dim);
    for (let row = 0; row < batch; row++) {
      if (state.bound === null) {
        for (let i = 0; i < dim; i++) unit[row * dim + i] = state.stream.uniform();
        continue;
      }
      for (;;) {
        sampleFromUnion(state.bound, state.stream, candidate, scratch);
        let inside = true;
        for (let i = 0; i < dim; i++) if (!(candidate[i] >= 0 && candidate[i] <= 1)) inside = false;
        if (inside) break;
      }
      unit.set(candidate, row * dim);
    }
    const physical = new Float64Array(batch * physicalDim);
    const lnL = await evaluator.evaluate(unit, batch, physical);
    let valid = 0;
    for (let row = 0; row < batch; row++) {
      if (!(lnL[row] > threshold)) continue;
      valid++;
      if (accepted < k) {
        newUnit.set(unit.subarray(row * dim, row * dim + dim), accepted * dim);
        newPhysical.set(physical.subarray(row * physicalDim, row * physicalDim + physicalDim), accepted * physicalDim);
        newLnL[accepted] = lnL[row];
        accepted++;
      } else if (state.spareLnL.count < livePoints) {
        state.spareUnit.push(unit, row * dim);
        state.sparePhysical.push(physical, row * physicalDim);
        state.spareLnL.pushValue(lnL[row]);
      }
    }
    const decay = Math.exp(-batch / efficiencyMemory);
    state.recentValid = state.recentValid * decay + valid;
    state.recentEvaluated = state.recentEvaluated * decay + batch;
    if (state.recentValid < 1e-3 * state.recentEvaluated) state.recentValid = 1e-3 * state.recentEvaluated;
  }
  state.replacementsAccepted += k;
  state.replacementEvaluations += absorbCounts(state, evaluator);
  insertNewPoints(state, slots, newUnit, newPhysical, newLnL);
}

/** One step with k slice-sampling chains (run side by side) started from random surviving live points. */
async function sliceStep(state: NestedState, evaluator: BatchEvaluator, problem: NestedProblem, early: EarlyChains | null): Promise<void> {
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
    await sliceChains(
      k, startUnit, startPhysical, startLnL, threshold, whitening, sliceSettings, state.stream, evaluator.evaluate,
      newUnit, newPhysical, newLnL, chainEvaluations,
    );
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

/** Assembles the result: dead points, then the final live points at X_final / N each. */
function finishedResult(state: NestedState, stopReason: NestedStopReason, early: EarlyChains | null): NestedResult {
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
  unitPoints.set(state.deadUnit.view());
  points.set(state.deadPhysical.view());
  let lnXBefore = state.lnXInitial;
  for (let i = 0; i < deadCount; i++) {
    lnL[i] = state.deadLnL.get(i);
    lnX[i] = state.deadLnX.get(i);
    lnWeight[i] = lnL[i] + lnVolumeSlice(lnXBefore, state.deadLiveCount.get(i));
    lnXBefore = lnX[i];
  }
  for (let j = 0; j < livePoints; j++) {
    const slot = order[j];
    const row = deadCount + j;
    unitPoints.set(state.liveUnit.subarray(slot * dim, slot * dim + dim), row * dim);
    points.set(state.livePhysical.subarray(slot * physicalDim, slot * physicalDim + physicalDim), row * physicalDim);
    lnL[row] = state.liveLnL[slot];
    lnX[row] = state.lnX + Math.log((livePoints - j) / livePoints);
    lnWeight[row] = lnL[row] + state.lnX - Math.log(livePoints);
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
  return {
    lnZ,
    // Skilling 2006 sqrt(H/N), plus in quadrature the relative error sqrt((1 - f)/N) of the
    // negative-binomial estimate of the finite fraction f when initial draws were impossible.
    lnZError: Math.sqrt((Math.max(0, information) + (1 - Math.exp(state.lnXInitial))) / livePoints),
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
    insertionRank,
    method,
    stopReason,
    livePoints,
    equalWeight: (samples?: number, sampleSeed: number = derivedSeed(seed, 3)) =>
      equalWeightResample(points, physicalDim, weightsFromLogWeights(lnWeight), sampleSeed, samples).points,
  };
}
