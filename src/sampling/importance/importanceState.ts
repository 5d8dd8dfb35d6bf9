import { SeededStream } from '../../numeric/random/seededStream.js';
import { GrowableRows } from '../nested/growableRows.js';
import { recordStudentMixture, restoreStudentMixture, type StudentMixture, type StudentMixtureRecord } from './studentMixture.js';

/** What one stage of the importance-sampling run found. */
export interface ImportanceStageSummary {
  /** 1, 2, ... for adaptation stages; 0 for the final one. */
  readonly stage: number;
  readonly draws: number;
  /** draws inside the unit cube, each one likelihood evaluation. */
  readonly evaluations: number;
  readonly components: number;
  readonly lnZ: number;
  readonly lnZError: number;
  readonly effectiveSampleSize: number;
  readonly paretoShape: number;
  /** exponent gamma of the weights w^gamma the next proposal was fitted to (1: the weights themselves). */
  readonly fitTempering: number;
}

/** The importance-sampling stage of a run, carried from batch to batch and through checkpoints. */
export interface ImportanceState {
  readonly dim: number;
  readonly physicalDim: number;
  /** cut of each periodic unit coordinate (periodicSeams); 0 for the others. */
  readonly seams: Float64Array;
  stream: SeededStream;
  /** adaptation stages finished. */
  stage: number;
  /** true once the final stage has begun; finalDraws is then its size; complete once it is done. */
  final: boolean;
  complete: boolean;
  finalDraws: number;
  /** the proposal of the current stage, and the best tested one with its effective-sample fraction. */
  proposal: StudentMixture;
  best: StudentMixture | null;
  bestFraction: number;
  readonly history: ImportanceStageSummary[];
  /** the current stage's draws inside the cube (frame and unit rows, physical rows, ln L, ln q) and all its draws. */
  readonly frame: GrowableRows;
  readonly unit: GrowableRows;
  readonly physical: GrowableRows;
  readonly lnL: GrowableRows;
  readonly lnQ: GrowableRows;
  drawn: number;
  /**
   * The adaptation stages' draws inside the cube so far (frame rows, ln L), with each stage's
   * proposal and number of draws: the pool the next proposal is fitted to.
   */
  readonly poolFrame: GrowableRows;
  readonly poolLnL: GrowableRows;
  readonly poolProposals: StudentMixture[];
  readonly poolDraws: number[];
  /** likelihood evaluations of every stage. */
  evaluations: number;
}

export function newImportanceState(dim: number, physicalDim: number, seams: Float64Array, proposal: StudentMixture, seed: number): ImportanceState {
  return {
    dim,
    physicalDim,
    seams,
    stream: SeededStream.fromSeed(seed),
    stage: 0,
    final: false,
    complete: false,
    finalDraws: 0,
    proposal,
    best: null,
    bestFraction: 0,
    history: [],
    frame: new GrowableRows(dim),
    unit: new GrowableRows(dim),
    physical: new GrowableRows(physicalDim),
    lnL: new GrowableRows(1),
    lnQ: new GrowableRows(1),
    drawn: 0,
    poolFrame: new GrowableRows(dim),
    poolLnL: new GrowableRows(1),
    poolProposals: [],
    poolDraws: [],
    evaluations: 0,
  };
}

/** Empties the current stage's draws for the next stage. */
export function clearStageDraws(state: ImportanceState): void {
  state.frame.clear();
  state.unit.clear();
  state.physical.clear();
  state.lnL.clear();
  state.lnQ.clear();
  state.drawn = 0;
}

/** ln w = ln L - ln q of the stage's draws inside the cube, then -Infinity for the draws outside it. */
export function stageLnWeights(state: ImportanceState): Float64Array {
  const lnW = new Float64Array(state.drawn).fill(-Infinity);
  for (let n = 0; n < state.lnL.count; n++) lnW[n] = state.lnL.get(n) - state.lnQ.get(n);
  return lnW;
}

/** Plain-JSON form of an ImportanceState (inside a nested-sampling checkpoint). */
export interface ImportanceStateRecord {
  readonly dim: number;
  readonly physicalDim: number;
  readonly seams: number[];
  readonly streamState: number[];
  readonly stage: number;
  readonly final: boolean;
  readonly complete: boolean;
  readonly finalDraws: number;
  readonly proposal: StudentMixtureRecord;
  readonly best: StudentMixtureRecord | null;
  readonly bestFraction: number;
  readonly history: ImportanceStageSummary[];
  readonly rows: { frame: number[]; unit: number[]; physical: number[]; lnL: number[]; lnQ: number[] };
  readonly drawn: number;
  readonly pool: { frame: number[]; lnL: number[]; proposals: StudentMixtureRecord[]; draws: number[] };
  readonly evaluations: number;
}

export function recordImportanceState(state: ImportanceState): ImportanceStateRecord {
  return {
    dim: state.dim,
    physicalDim: state.physicalDim,
    seams: Array.from(state.seams),
    streamState: state.stream.stateWords(),
    stage: state.stage,
    final: state.final,
    complete: state.complete,
    finalDraws: state.finalDraws,
    proposal: recordStudentMixture(state.proposal),
    best: state.best === null ? null : recordStudentMixture(state.best),
    bestFraction: state.bestFraction,
    history: state.history.map((h) => ({ ...h })),
    rows: {
      frame: Array.from(state.frame.view()),
      unit: Array.from(state.unit.view()),
      physical: Array.from(state.physical.view()),
      lnL: Array.from(state.lnL.view()),
      lnQ: Array.from(state.lnQ.view()),
    },
    drawn: state.drawn,
    pool: {
      frame: Array.from(state.poolFrame.view()),
      lnL: Array.from(state.poolLnL.view()),
      proposals: state.poolProposals.map(recordStudentMixture),
      draws: state.poolDraws.slice(),
    },
    evaluations: state.evaluations,
  };
}

export function restoreImportanceState(record: ImportanceStateRecord): ImportanceState {
  const state = newImportanceState(record.dim, record.physicalDim, Float64Array.from(record.seams), restoreStudentMixture(record.proposal), 1);
  state.stream = SeededStream.fromState(record.streamState);
  state.stage = record.stage;
  state.final = record.final;
  state.complete = record.complete;
  state.finalDraws = record.finalDraws;
  state.best = record.best === null ? null : restoreStudentMixture(record.best);
  state.bestFraction = record.bestFraction;
  state.history.push(...record.history);
  for (const name of ['frame', 'unit', 'physical', 'lnL', 'lnQ'] as const) {
    const table = state[name];
    const values = record.rows[name];
    for (let offset = 0; offset + table.width <= values.length; offset += table.width) table.push(values, offset);
  }
  state.drawn = record.drawn;
  for (let offset = 0; offset + record.dim <= record.pool.frame.length; offset += record.dim) state.poolFrame.push(record.pool.frame, offset);
  for (const value of record.pool.lnL) state.poolLnL.pushValue(value);
  state.poolProposals.push(...record.pool.proposals.map(restoreStudentMixture));
  state.poolDraws.push(...record.pool.draws);
  state.evaluations = record.evaluations;
  return state;
}
