import { SeededStream } from '../../numeric/random/seededStream.js';
import { proposeDifferentialEvolution } from './differentialEvolutionMove.js';
import { loadEnsembleCheckpoint, saveEnsembleCheckpoint } from './ensembleCheckpoint.js';
import { settleEnsembleOptions, type EnsembleOptions, type SettledEnsembleOptions } from './ensembleOptions.js';
import type { EnsembleProblem } from './ensembleProblem.js';
import { chainDiagnostics, type EnsembleResult } from './ensembleResult.js';
import type { EnsembleState } from './ensembleState.js';
import { isCheckSweep, mixingCheck, mixingDiagnostics } from './mixingCheck.js';
import { evaluateBatch } from './evaluateBatch.js';
import { GrowableChain } from './growableChain.js';
import { periodicTable, wrapRows } from './periodicWrap.js';
import { startingEnsemble } from './startingEnsemble.js';
import { eventLoopTurn } from '../eventLoopTurn.js';
import { proposeStretch } from './stretchMove.js';

/**
 * Ensemble MCMC over `problem.dim` free parameters. Each sweep moves the two halves of the
 * walkers in turn, each half against the other, which keeps the moves valid (Goodman & Weare
 * 2010, sec. 3: a walker moves against the complementary ensemble) while a half's proposals are
 * independent, so each half goes to `logPosterior` in one batch. Every random draw is
 * made outside the batch call, so a seed fixes the result however the batch is evaluated.
 * The run stops at maxSweeps, on a stop request, or when the stop rule (mixingCheck) is met at
 * one of its checks (isCheckSweep). With a checkpoint, an interrupted run resumes bit-identically.
 */
export async function runEnsemble(problem: EnsembleProblem, options: EnsembleOptions): Promise<EnsembleResult> {
  const dim = problem.dim;
  const settled = settleEnsembleOptions(dim, options);
  const { walkers, thin } = settled;
  const checkpoint = options.checkpoint;
  const periodic = periodicTable(problem);

  let state = options.resume && checkpoint ? loadEnsembleCheckpoint(checkpoint.path, dim, settled, checkpoint.checkIdentity) : null;
  if (state === null) state = await freshState(problem, options, settled);
  else if (state.sweep > 0 && isCheckSweep(state.sweep, settled.checkEverySweeps)) checkStopRule(state, settled, dim);
  if (state.tallies !== undefined) problem.tallies?.restore(state.tallies);

  const half = walkers / 2;
  const proposals = new Float64Array(half * dim);
  const logCorrection = new Float64Array(half);
  const jitterScale = new Float64Array(dim);
  let stopped = false;
  let savedAt = -1;
  let savedTime = performance.now();
  const save = (): void => {
    if (checkpoint === undefined) return;
    saveEnsembleCheckpoint(checkpoint.path, dim, settled, state, checkpoint.identity, problem.tallies?.read());
    savedAt = state.sweep;
    savedTime = performance.now();
  };

  while (state.sweep < settled.maxSweeps && state.lastCheck?.met !== true) {
    await eventLoopTurn();
    if (options.signal?.stopRequested) {
      stopped = true;
      break;
    }
    const proposal = pickProposal(settled, state.random);
    for (let part = 0; part < 2; part++) {
      const first = part * half;
      const other = (1 - part) * half;
      if (proposal === 'stretch') {
        proposeStretch(state.positions, dim, first, half, other, half, state.random, settled.stretchScale,
          proposals, logCorrection);
      } else {
        proposeDifferentialEvolution(state.positions, dim, first, half, other, half, state.random,
          settled.gamma, settled.jitter, proposals, logCorrection, jitterScale);
      }
      wrapRows(proposals, half, dim, periodic);
      const values = await evaluateBatch(problem.logPosterior, proposals, half);
      state.evaluations += half;
      acceptOrReject(state, first, half, dim, proposals, values, logCorrection);
    }
    state.sweep++;
    if (state.sweep % thin === 0) state.chain.append(state.positions, state.logDensities);
    if (isCheckSweep(state.sweep, settled.checkEverySweeps)) checkStopRule(state, settled, dim);
    if (checkpoint !== undefined && performance.now() - savedTime >= checkpoint.everySeconds * 1000) save();
    options.onProgress?.({
      sweep: state.sweep,
      maxSweeps: settled.maxSweeps,
      evaluations: state.evaluations,
      acceptanceFraction: meanOf(state.accepted) / state.sweep,
      smallestEffectiveSampleSize: state.lastCheck?.smallestEffectiveSampleSize ?? Number.NaN,
      largestRHat: state.lastCheck?.largestRHat ?? Number.NaN,
    });
  }
  if (savedAt !== state.sweep) save();
  return summarise(state, settled, dim, stopped);
}

async function freshState(
  problem: EnsembleProblem, options: EnsembleOptions, settled: SettledEnsembleOptions,
): Promise<EnsembleState> {
  const random = SeededStream.fromSeed(settled.seed);
  const start = await startingEnsemble(problem, settled.walkers, options.start, random, periodicTable(problem));
  return {
    sweep: 0,
    positions: start.positions,
    logDensities: start.logDensities,
    accepted: new Float64Array(settled.walkers),
    evaluations: start.evaluations,
    nonFiniteProposals: 0,
    lastCheck: null,
    chain: new GrowableChain(settled.walkers, problem.dim),
    random,
  };
}

function pickProposal(settled: SettledEnsembleOptions, random: SeededStream): string {
  const { kinds, cumulative } = settled.proposals;
  if (kinds.length === 1) return kinds[0];
  const u = random.uniform();
  let k = 0;
  while (k < kinds.length - 1 && u >= cumulative[k]) k++;
  return kinds[k];
}

// Metropolis-Hastings acceptance min(1, exp(logCorrection + log p(Y) - log p(X))) (Goodman & Weare
// 2010, eq. 8, for the stretch move's z^(d-1)); a non-finite log p(Y) is a rejection.
function acceptOrReject(
  state: EnsembleState, first: number, count: number, dim: number,
  proposals: Float64Array, values: Float64Array, logCorrection: Float64Array,
): void {
  const { positions, logDensities, accepted, random } = state;
  for (let i = 0; i < count; i++) {
    const walker = first + i;
    const u = random.uniform();
    const value = values[i];
    if (!Number.isFinite(value)) {
      state.nonFiniteProposals++;
      continue;
    }
    if (Math.log(u) < logCorrection[i] + value - logDensities[walker]) {
      positions.set(proposals.subarray(i * dim, (i + 1) * dim), walker * dim);
      logDensities[walker] = value;
      accepted[walker]++;
    }
  }
}

// The stop rule over the retained part of the stored chain (mixingCheck.ts); without a rule, none.
function checkStopRule(state: EnsembleState, settled: SettledEnsembleOptions, dim: number): void {
  if (settled.stopRule === null) return;
  const rows = state.chain.rows;
  const layout = { steps: rows, walkers: settled.walkers, dim };
  state.lastCheck = mixingCheck(mixingDiagnostics(state.chain.positionRows(), layout, Math.floor(rows * settled.burnInFraction)), settled.stopRule);
}

function summarise(state: EnsembleState, settled: SettledEnsembleOptions, dim: number, stopped: boolean): EnsembleResult {
  const steps = state.chain.rows;
  const walkers = settled.walkers;
  const chain = state.chain.positionRows().slice();
  const retainedFrom = Math.floor(steps * settled.burnInFraction);
  const acceptanceFraction = new Float64Array(walkers);
  for (let w = 0; w < walkers; w++) acceptanceFraction[w] = state.sweep > 0 ? state.accepted[w] / state.sweep : Number.NaN;
  return {
    chain,
    logPosterior: state.chain.logDensityRows().slice(),
    steps,
    walkers,
    dim,
    thin: settled.thin,
    sweeps: state.sweep,
    retainedFrom,
    acceptanceFraction,
    ...chainDiagnostics(chain, { steps, walkers, dim }, retainedFrom, settled.thin),
    evaluations: state.evaluations,
    nonFiniteProposals: state.nonFiniteProposals,
    converged: state.lastCheck?.met === true,
    stopped,
  };
}

function meanOf(values: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < values.length; i++) sum += values[i];
  return sum / values.length;
}
