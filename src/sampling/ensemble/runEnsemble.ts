import { ensembleAutocorrelationTimes } from '../diagnostics/integratedAutocorrelationTime.js';
import { SeededStream } from '../../numeric/random/seededStream.js';
import { proposeDifferentialEvolution } from './differentialEvolutionMove.js';
import { loadEnsembleCheckpoint, saveEnsembleCheckpoint } from './ensembleCheckpoint.js';
import { settleEnsembleOptions, type EnsembleOptions, type SettledEnsembleOptions } from './ensembleOptions.js';
import type { EnsembleProblem } from './ensembleProblem.js';
import { chainDiagnostics, type EnsembleResult } from './ensembleResult.js';
import type { EnsembleState } from './ensembleState.js';
import { evaluateBatch } from './evaluateBatch.js';
import { GrowableChain } from './growableChain.js';
import { periodicTable, wrapRows } from './periodicWrap.js';
import { startingEnsemble } from './startingEnsemble.js';
import { proposeStretch } from './stretchMove.js';

/**
 * Ensemble MCMC over `problem.dim` free parameters. Each iteration moves the two halves of the
 * walkers in turn, each half against the other, which keeps the moves valid (Goodman & Weare
 * 2010, sec. 3: a walker moves against the complementary ensemble) while a half's proposals are
 * independent, so each half goes to `logPosterior` in one batch. Every random draw is
 * made outside the batch call, so a seed fixes the result however the batch is evaluated.
 * With a checkpoint, an interrupted run resumes bit-identically.
 */
export async function runEnsemble(problem: EnsembleProblem, options: EnsembleOptions): Promise<EnsembleResult> {
  const dim = problem.dim;
  const settled = settleEnsembleOptions(dim, options);
  const { walkers, thin } = settled;
  const checkpoint = options.checkpoint;
  const periodic = periodicTable(problem);

  let state = options.resume && checkpoint ? loadEnsembleCheckpoint(checkpoint.path, dim, settled) : null;
  if (state === null) state = await freshState(problem, options, settled);

  const half = walkers / 2;
  const proposals = new Float64Array(half * dim);
  const logCorrection = new Float64Array(half);
  const jitterScale = new Float64Array(dim);
  let stopped = false;
  let savedAt = -1;

  while (state.iteration < settled.maxSteps && !state.converged) {
    if (options.signal?.stopRequested) {
      stopped = true;
      break;
    }
    const move = pickMove(settled, state.random);
    for (let part = 0; part < 2; part++) {
      const first = part * half;
      const other = (1 - part) * half;
      if (move === 'stretch') {
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
    state.iteration++;
    if (state.iteration % thin === 0) state.chain.append(state.positions, state.logDensities);
    if (settled.targetAutocorrelationTimes !== null && state.iteration % settled.checkEvery === 0) {
      checkConvergence(state, settled, dim);
    }
    if (checkpoint && state.iteration % checkpoint.everySteps === 0) {
      saveEnsembleCheckpoint(checkpoint.path, dim, settled, state);
      savedAt = state.iteration;
    }
    options.onProgress?.({
      iteration: state.iteration,
      maxSteps: settled.maxSteps,
      evaluations: state.evaluations,
      acceptanceFraction: meanOf(state.accepted) / state.iteration,
      autocorrelationTimeMax: state.autocorrelationTimeMax,
    });
  }
  if (checkpoint && savedAt !== state.iteration) {
    saveEnsembleCheckpoint(checkpoint.path, dim, settled, state);
  }
  return summarise(state, settled, dim, stopped);
}

async function freshState(
  problem: EnsembleProblem, options: EnsembleOptions, settled: SettledEnsembleOptions,
): Promise<EnsembleState> {
  const random = SeededStream.fromSeed(settled.seed);
  const start = await startingEnsemble(problem, settled.walkers, options.start, random, periodicTable(problem));
  return {
    iteration: 0,
    positions: start.positions,
    logDensities: start.logDensities,
    accepted: new Float64Array(settled.walkers),
    evaluations: start.evaluations,
    nonFiniteProposals: 0,
    previousTau: null,
    autocorrelationTimeMax: Number.NaN,
    converged: false,
    chain: new GrowableChain(settled.walkers, problem.dim),
    random,
  };
}

function pickMove(settled: SettledEnsembleOptions, random: SeededStream): string {
  const { kinds, cumulative } = settled.moves;
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

// Stopping rule (common practice for ensemble samplers): the retained chain is longer than N tau_max
// and every tau moved by less than the tolerance since the last check; tau as in Sokal 1997.
function checkConvergence(state: EnsembleState, settled: SettledEnsembleOptions, dim: number): void {
  const rows = state.chain.rows;
  const from = Math.floor(rows * settled.burnInFraction);
  if (rows - from < 2) return;
  const { tau, reliable } = ensembleAutocorrelationTimes(
    state.chain.positionRows(), { steps: rows, walkers: settled.walkers, dim }, from,
  );
  let tauMax = 0;
  let stable = state.previousTau !== null;
  for (let k = 0; k < dim; k++) {
    tauMax = Math.max(tauMax, tau[k]);
    if (state.previousTau !== null
      && !(Math.abs(state.previousTau[k] - tau[k]) < settled.autocorrelationTolerance * tau[k])) {
      stable = false;
    }
  }
  state.autocorrelationTimeMax = tauMax * settled.thin;
  state.previousTau = tau;
  state.converged = reliable && stable
    && (rows - from) * settled.thin > (settled.targetAutocorrelationTimes as number) * state.autocorrelationTimeMax;
}

function summarise(state: EnsembleState, settled: SettledEnsembleOptions, dim: number, stopped: boolean): EnsembleResult {
  const steps = state.chain.rows;
  const walkers = settled.walkers;
  const chain = state.chain.positionRows().slice();
  const retainedFrom = Math.floor(steps * settled.burnInFraction);
  const acceptanceFraction = new Float64Array(walkers);
  for (let w = 0; w < walkers; w++) acceptanceFraction[w] = state.iteration > 0 ? state.accepted[w] / state.iteration : Number.NaN;
  return {
    chain,
    logPosterior: state.chain.logDensityRows().slice(),
    steps,
    walkers,
    dim,
    thin: settled.thin,
    iterations: state.iteration,
    retainedFrom,
    acceptanceFraction,
    ...chainDiagnostics(chain, { steps, walkers, dim }, retainedFrom, settled.thin),
    evaluations: state.evaluations,
    nonFiniteProposals: state.nonFiniteProposals,
    converged: state.converged,
    stopped,
  };
}

function meanOf(values: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < values.length; i++) sum += values[i];
  return sum / values.length;
}
