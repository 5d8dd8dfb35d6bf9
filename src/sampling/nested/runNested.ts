import { InputError, expectedFound } from '../../errors.js';
import { readCheckpoint, writeCheckpoint } from './checkpoint.js';
import { logAddExp } from '../../numeric/statistics/logSumExp.js';
import type { NestedOptions, NestedProblem, NestedProgress, NestedResult, NestedStopReason } from './nestedProblem.js';
import { emptyState, recordState, restoreState, type NestedState } from './nestedState.js';
import { EarlyChains } from './earlyChains.js';
import { BatchEvaluator } from './batchEvaluator.js';
import { resolveNestedSettings } from './nestedSettings.js';
import { iterationsOf, drawInitialLivePoints, maxLiveLnL, absorbCounts } from './liveSet.js';
import { runImportance } from '../importance/runImportance.js';
import { ellipsoidStep } from './ellipsoidStep.js';
import { sliceStep } from './sliceStep.js';
import { nestedResultOf } from './nestedResult.js';
import { eventLoopTurn } from '../eventLoopTurn.js';

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
 * fixes the result. With evidence 'importance' a converged run goes on to the importance stage
 * (runImportance), whose ln Z and error the result then carries; the checkpoint holds both stages.
 */
export async function runNested(problem: NestedProblem, options: NestedOptions = {}): Promise<NestedResult> {
  const settings = resolveNestedSettings(problem, options);
  const tolerance = options.lnZTolerance ?? 0.1;
  if (!(tolerance > 0)) throw new InputError(`nested sampling lnZTolerance: ${expectedFound('a positive number', tolerance)}`);
  const checkpointPath = options.checkpoint?.path;
  if (options.resume === true && checkpointPath === undefined) {
    throw new InputError(`nested sampling resume: ${expectedFound('a checkpoint.path to resume from', undefined)}`);
  }
  const record = options.resume === true && checkpointPath !== undefined ? readCheckpoint(checkpointPath, settings, options.checkpoint?.checkIdentity) : null;
  const evaluator = new BatchEvaluator(problem);
  const early = problem.runSliceChain !== undefined && problem.idleThreads !== undefined
    ? new EarlyChains((request, stop) => problem.runSliceChain!(request, stop), () => problem.idleThreads!())
    : null;
  let state: NestedState;
  if (record !== null) {
    state = restoreState(record);
    if (record.tallies !== undefined) problem.tallies?.restore(record.tallies);
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
    const tallies = problem.tallies?.read();
    writeCheckpoint(checkpointPath, tallies === undefined ? recordState(state) : { ...recordState(state), tallies }, options.checkpoint?.identity);
    lastCheckpointTime = Date.now();
    lastCheckpointIteration = iterationsOf(state);
  };
  const report = () => options.onProgress?.(progressOf(state, elapsed()));

  let stopReason: NestedStopReason;
  for (;;) {
    await eventLoopTurn();
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
  if (settings.importance !== null && stopReason === 'converged') {
    // The stage boundary is checkpointed only when one is due: --checkpoint-seconds is the user's.
    const checkpointDue = () => {
      const checkpoint = options.checkpoint;
      return checkpoint !== undefined && (checkpoint.everyIterations !== undefined ||
        (checkpoint.everySeconds !== undefined && Date.now() - lastCheckpointTime >= checkpoint.everySeconds * 1000));
    };
    if (checkpointDue()) saveCheckpoint();
    const nested = nestedResultOf(state, stopReason, early);
    const outcome = await runImportance({
      dim: settings.dim,
      physicalDim: settings.physicalDim,
      periodic: settings.periodic,
      seed: settings.seed,
      settings: settings.importance,
      evaluator,
      nested,
      evaluationsLeft: () => (options.maxEvaluations ?? Infinity) - state.evaluations,
      stopRequested: () => options.signal?.stopRequested === true,
      afterBatch: (importance) => {
        state.importance = importance;
        absorbCounts(state, evaluator);
        if (checkpointDue()) saveCheckpoint();
      },
    }, state.importance);
    state.importance = outcome.state;
    absorbCounts(state, evaluator);
    stopReason = outcome.stopReason;
  }
  saveCheckpoint();
  report();
  return nestedResultOf(state, stopReason, early);
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
