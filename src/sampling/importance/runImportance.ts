import { derivedSeed } from '../../numeric/random/derivedSeed.js';
import type { BatchEvaluator } from '../nested/batchEvaluator.js';
import { importanceEstimate } from './importanceEstimate.js';
import type { ImportanceSettings } from './importanceSettings.js';
import { clearStageDraws, newImportanceState, stageLnWeights, type ImportanceState } from './importanceState.js';
import { learnProposal, type ProposalShape } from './learnProposal.js';
import { fromFrame, periodicSeams, toFrame } from './periodicSeams.js';
import { drawFromStudentMixture, StudentMixtureDensity } from './studentMixture.js';
import { temperedWeights } from './temperedWeights.js';
import { logSumExp } from '../../numeric/statistics/logSumExp.js';
import { eventLoopTurn } from '../eventLoopTurn.js';

/** Draws per likelihood call (and between checkpoints); results do not depend on it. */
export const importanceBatch = 250;

/** Rows a proposal is fitted to at most (see learnProposal). */
const maxFitRows = 3000;

/** Weighted points of a nested-sampling run: unit rows, ln L and normalised posterior ln weights. */
export interface WeightedUnitPoints {
  readonly unitPoints: Float64Array;
  readonly lnL: Float64Array;
  readonly lnWeight: Float64Array;
  readonly count: number;
}

/** What the importance stage needs from the run around it. */
export interface ImportanceRun {
  readonly dim: number;
  readonly physicalDim: number;
  readonly periodic: readonly boolean[];
  readonly seed: number;
  readonly settings: ImportanceSettings;
  readonly evaluator: BatchEvaluator;
  /** the nested run's points, from which the first proposal is learned. */
  readonly nested: WeightedUnitPoints;
  /** evaluations still allowed (Infinity for no limit). */
  readonly evaluationsLeft: () => number;
  readonly stopRequested: () => boolean;
  /** called after every batch (checkpoints). */
  readonly afterBatch: (state: ImportanceState) => void;
}

/** Effective points a proposal is fitted to at least; fewer, and the weights are tempered (temperedWeights). */
export function minimumFitPoints(dim: number): number {
  return 4 * (dim + 1);
}

/**
 * Importance sampling of the evidence from a proposal learned from a nested-sampling run
 * (importance sampling after nested sampling, in the spirit of Feroz, Hobson, Cameron & Pettitt
 * 2019, OJAp 2, 10, with a learned proposal as in Lange 2023, MNRAS 525, 3181). A Student-t
 * mixture is fitted to the nested run's posterior points (learnProposal), then adapted over at
 * most maxStages stages of drawsPerStage draws: each stage's weights L pi / q refit the next
 * proposal (population Monte Carlo, Cappe, Guillin, Marin & Robert 2004, JCGS 13, 907), tempered
 * when too uneven. The final stage draws afresh from the adaptation stage's proposal with the
 * largest effective-sample fraction f, n = (1/f - 1) / targetLnZError^2 draws (the relative
 * variance of the mean weight, Owen 2013, eq. 9.8), and its draws alone give ln Z and its error,
 * so that neither depends on the adaptation's choices. Draws outside the unit cube have zero
 * prior density: weight 0, no evaluation. Returns when the final stage is done, or stopped.
 */
export async function runImportance(
  run: ImportanceRun, resumed: ImportanceState | null,
): Promise<{ state: ImportanceState; stopReason: 'converged' | 'interrupted' | 'maxEvaluations' }> {
  const state = resumed ?? firstState(run);
  if (state.complete) return { state, stopReason: 'converged' };
  for (;;) {
    const target = state.final ? state.finalDraws : run.settings.drawsPerStage;
    if (state.drawn >= target) {
      if (finishStage(state, run)) return { state, stopReason: 'converged' };
      continue;
    }
    // A turn of the event loop lets a signal handler set stopRequested (as runNested's loop does).
    await eventLoopTurn();
    if (run.stopRequested()) return { state, stopReason: 'interrupted' };
    if (run.evaluationsLeft() <= 0) return { state, stopReason: 'maxEvaluations' };
    await drawBatch(state, run, Math.min(importanceBatch, target - state.drawn));
    run.afterBatch(state);
  }
}

function proposalShape(settings: ImportanceSettings): ProposalShape {
  return { dof: settings.dof, scale: settings.scale, defensive: settings.defensive, wide: settings.wide, maxComponents: settings.maxComponents, maxRows: maxFitRows };
}

/** The seams and the first proposal, learned from the nested run's points (tempered if too few carry the posterior). */
function firstState(run: ImportanceRun): ImportanceState {
  const { dim, nested } = run;
  const posterior = Float64Array.from(nested.lnWeight, Math.exp);
  const seams = periodicSeams(nested.unitPoints, posterior, nested.count, dim, run.periodic);
  const frame = new Float64Array(nested.count * dim);
  for (let i = 0; i < nested.count; i++) toFrame(nested.unitPoints, i * dim, seams, frame, i * dim);
  // The power posterior L^gamma pi from the nested run's weights w = L dX: t = ln L, b = ln dX.
  const lnVolume = new Float64Array(nested.count);
  for (let i = 0; i < nested.count; i++) lnVolume[i] = nested.lnL[i] === -Infinity ? 0 : nested.lnWeight[i] - nested.lnL[i];
  const { weights } = temperedWeights(nested.lnL, lnVolume, nested.count, minimumFitPoints(dim));
  const proposal = learnProposal(frame, weights, nested.count, dim, proposalShape(run.settings), derivedSeed(run.seed, 5));
  return newImportanceState(dim, run.physicalDim, seams, proposal, derivedSeed(run.seed, 4));
}

/** `count` draws of the current stage: the ones inside the cube are evaluated in one call. */
async function drawBatch(state: ImportanceState, run: ImportanceRun, count: number): Promise<void> {
  const { dim, physicalDim } = run;
  const density = new StudentMixtureDensity(state.proposal);
  const frame = new Float64Array(count * dim);
  const unit = new Float64Array(count * dim);
  const lnQ = new Float64Array(count);
  const draw = new Float64Array(dim);
  const scratch = new Float64Array(dim);
  let inside = 0;
  for (let n = 0; n < count; n++) {
    drawFromStudentMixture(state.proposal, state.stream, draw, scratch);
    let inCube = true;
    for (let j = 0; j < dim; j++) if (!(draw[j] >= 0 && draw[j] < 1)) inCube = false;
    if (!inCube) continue;
    frame.set(draw, inside * dim);
    fromFrame(draw, 0, state.seams, unit, inside * dim);
    lnQ[inside] = density.lnDensity(draw, 0);
    inside++;
  }
  state.drawn += count;
  if (inside === 0) return;
  const physical = new Float64Array(inside * physicalDim);
  const lnL = await run.evaluator.evaluate(unit, inside, physical);
  state.evaluations += inside;
  for (let n = 0; n < inside; n++) {
    state.frame.push(frame, n * dim);
    state.unit.push(unit, n * dim);
    state.physical.push(physical, n * physicalDim);
    state.lnL.pushValue(lnL[n]);
    state.lnQ.pushValue(lnQ[n]);
  }
}

/**
 * ln w = ln L - ln q_pool of the pooled adaptation draws, q_pool = sum_s (n_s / n) q_s the mixture
 * of the stages' proposals in proportion to their draws: the deterministic-mixture (balance
 * heuristic) weights of Veach & Guibas 1995 (SIGGRAPH, Section 3) and Owen & Zhou 2000 (JASA 95,
 * 135), as adaptive multiple importance sampling pools its stages (Cornuet, Marin, Mira & Robert
 * 2012, Scandinavian Journal of Statistics 39, 798).
 */
function pooledLnWeights(state: ImportanceState): Float64Array {
  const densities = state.poolProposals.map((proposal) => new StudentMixtureDensity(proposal));
  let total = 0;
  for (const draws of state.poolDraws) total += draws;
  const lnShare = state.poolDraws.map((draws) => Math.log(draws / total));
  const count = state.poolLnL.count;
  const rows = state.poolFrame.view();
  const lnW = new Float64Array(count);
  const terms = new Float64Array(densities.length);
  for (let n = 0; n < count; n++) {
    for (let s = 0; s < densities.length; s++) terms[s] = lnShare[s] + densities[s].lnDensity(rows, n * state.dim);
    lnW[n] = state.poolLnL.get(n) - logSumExp(terms);
  }
  return lnW;
}

/**
 * Ends a stage: the final one finishes the run (true); an adaptation stage records its estimate,
 * keeps its proposal if it is the best so far, fits the next one to its weights, and decides
 * whether to adapt on (at most maxStages stages, and only while a stage raises the best
 * effective-sample fraction by 10%) or to draw the final stage.
 */
function finishStage(state: ImportanceState, run: ImportanceRun): boolean {
  const { settings, dim } = run;
  const lnW = stageLnWeights(state);
  const estimate = importanceEstimate(lnW);
  const summary = {
    stage: state.final ? 0 : state.stage + 1,
    draws: state.drawn,
    evaluations: state.lnL.count,
    components: state.proposal.components.length,
    lnZ: estimate.lnZ,
    lnZError: estimate.lnZError,
    effectiveSampleSize: estimate.effectiveSampleSize,
    paretoShape: estimate.paretoShape,
    fitTempering: 1,
  };
  if (state.final) {
    state.history.push(summary);
    state.complete = true;
    return true;
  }
  state.stage++;
  const fraction = estimate.positiveDraws > 0 ? estimate.effectiveSampleSize / state.drawn : 0;
  const improved = fraction > 1.1 * state.bestFraction;
  if (state.best === null || fraction > state.bestFraction) {
    state.best = state.proposal;
    state.bestFraction = fraction;
  }
  for (let n = 0; n < state.lnL.count; n++) {
    state.poolFrame.push(state.frame.view(), n * dim);
    state.poolLnL.pushValue(state.lnL.get(n));
  }
  state.poolProposals.push(state.proposal);
  state.poolDraws.push(state.drawn);
  const adaptOn = state.stage < settings.maxStages && (state.stage < 2 || improved) && estimate.positiveDraws > 0;
  if (adaptOn) {
    const pooled = pooledLnWeights(state);
    const { weights, gamma } = temperedWeights(pooled, null, pooled.length, minimumFitPoints(dim));
    state.history.push({ ...summary, fitTempering: gamma });
    state.proposal = learnProposal(state.poolFrame.view(), weights, pooled.length, dim, proposalShape(settings), derivedSeed(run.seed, 5 + state.stage));
  } else {
    state.history.push(summary);
    state.final = true;
    state.proposal = state.best;
    const f = state.bestFraction;
    const wanted = f > 0 ? Math.ceil((1 / f - 1) / settings.targetLnZError ** 2) : settings.maxFinalDraws;
    state.finalDraws = Math.min(settings.maxFinalDraws, Math.max(settings.drawsPerStage, wanted));
  }
  clearStageDraws(state);
  return false;
}
