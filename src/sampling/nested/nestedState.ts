import { GrowableRows } from './growableRows.js';
import { lnVolumeSlice } from './shrinkage.js';
import { recordEllipsoidUnion, restoreEllipsoidUnion } from './multiEllipsoid.js';
import type { EllipsoidUnion, EllipsoidUnionRecord } from './multiEllipsoid.js';
import { SeededStream } from '../../numeric/random/seededStream.js';
import type { ImportanceSettings } from '../importance/importanceSettings.js';
import { recordImportanceState, restoreImportanceState, type ImportanceState, type ImportanceStateRecord } from '../importance/importanceState.js';

/** Settings that fix a run's random sequence; a checkpoint resumes only with the same ones. */
export interface NestedSettings {
  readonly dim: number;
  readonly physicalDim: number;
  readonly livePoints: number;
  readonly seed: number;
  readonly method: 'ellipsoids' | 'slice';
  readonly replacementsPerStep: number;
  readonly enlargement: number;
  readonly minimumClusterSize: number;
  readonly bootstraps: number;
  readonly boundUpdateInterval: number;
  readonly sliceSteps: number;
  /** points each slice chain puts into one likelihood call (see SliceSettings.pointsPerChain). */
  readonly slicePointsPerChain: number;
  /** slice chains move within clusters of the live points (see NestedOptions.slice). */
  readonly sliceClusters: boolean;
  readonly sliceWidthScale: number;
  readonly periodic: readonly boolean[];
  readonly boundVolumeFactorForTesting: number;
  readonly evidence: 'nested' | 'importance';
  /** the importance stage's settings (null with evidence 'nested'). */
  readonly importance: ImportanceSettings | null;
}

/** Everything a run carries from one step to the next, so that a resumed run continues bit for bit. */
export interface NestedState {
  readonly settings: NestedSettings;
  readonly liveUnit: Float64Array;
  readonly livePhysical: Float64Array;
  readonly liveLnL: Float64Array;
  readonly deadUnit: GrowableRows;
  readonly deadPhysical: GrowableRows;
  readonly deadLnL: GrowableRows;
  readonly deadLnX: GrowableRows;
  /** ln of the prior-volume slice each dead point carries into ln Z (see removeLowest). */
  readonly deadLnSlice: GrowableRows;
  /** live points of the dead point's cluster when it was removed. */
  readonly deadLiveCount: GrowableRows;
  /** insertion rank of each new live point, and how many live points it was ranked among. */
  readonly rankValue: GrowableRows;
  readonly rankOthers: GrowableRows;
  /** valid ellipsoid-method candidates left over from earlier batches, in draw order. */
  readonly spareUnit: GrowableRows;
  readonly sparePhysical: GrowableRows;
  readonly spareLnL: GrowableRows;
  stream: SeededStream;
  lnXInitial: number;
  lnX: number;
  lnZDead: number;
  steps: number;
  evaluations: number;
  nonFiniteCount: number;
  initialFinite: number;
  initialDrawn: number;
  replacementsAccepted: number;
  replacementEvaluations: number;
  /** decaying counts of valid and evaluated candidates, for sizing ellipsoid batches. */
  recentValid: number;
  recentEvaluated: number;
  /** current bound (null: draw from the whole cube). */
  bound: EllipsoidUnion | null;
  boundBuiltAt: number;
  /**
   * slice sampling: the live points' clusters (label per slot, -1 for a freed slot; see
   * liveClusters.ts), each cluster's ln X, the Cholesky factor of each cluster's covariance, and
   * when they were built.
   */
  readonly liveCluster: Int32Array;
  clusterLnX: Float64Array;
  whitenings: Float64Array[] | null;
  whiteningBuiltAt: number;
  /** slice sampling: evaluations of all chains, and of each step's longest chain, summed over steps. */
  chainEvaluations: number;
  longestChainEvaluations: number;
  elapsedSeconds: number;
  /** the importance stage, once begun. */
  importance: ImportanceState | null;
}

export function emptyState(settings: NestedSettings): NestedState {
  const { dim, physicalDim, livePoints } = settings;
  return {
    settings,
    liveUnit: new Float64Array(livePoints * dim),
    livePhysical: new Float64Array(livePoints * physicalDim),
    liveLnL: new Float64Array(livePoints),
    deadUnit: new GrowableRows(dim),
    deadPhysical: new GrowableRows(physicalDim),
    deadLnL: new GrowableRows(1),
    deadLnX: new GrowableRows(1),
    deadLnSlice: new GrowableRows(1),
    deadLiveCount: new GrowableRows(1),
    rankValue: new GrowableRows(1),
    rankOthers: new GrowableRows(1),
    spareUnit: new GrowableRows(dim, 16),
    sparePhysical: new GrowableRows(physicalDim, 16),
    spareLnL: new GrowableRows(1, 16),
    stream: SeededStream.fromSeed(settings.seed),
    lnXInitial: 0,
    lnX: 0,
    lnZDead: -Infinity,
    steps: 0,
    evaluations: 0,
    nonFiniteCount: 0,
    initialFinite: 0,
    initialDrawn: 0,
    replacementsAccepted: 0,
    replacementEvaluations: 0,
    recentValid: 1,
    recentEvaluated: 1,
    bound: null,
    boundBuiltAt: -Infinity,
    liveCluster: new Int32Array(livePoints),
    clusterLnX: Float64Array.of(0),
    whitenings: null,
    whiteningBuiltAt: -Infinity,
    chainEvaluations: 0,
    longestChainEvaluations: 0,
    elapsedSeconds: 0,
    importance: null,
  };
}

/** Plain-JSON form of a state (non-finite numbers are encoded by the checkpoint writer). */
export interface NestedStateRecord {
  readonly settings: NestedSettings;
  readonly arrays: Record<string, number[]>;
  readonly scalars: Record<string, number>;
  readonly streamState: number[];
  readonly bound: EllipsoidUnionRecord | null;
  /** one Cholesky factor per cluster (version 1 files hold one, `whitening`). */
  readonly whitenings?: number[][] | null;
  readonly whitening?: number[] | null;
  /** the importance stage, once begun (absent in version 1 files). */
  readonly importance?: ImportanceStateRecord | null;
  /** the problem's RunTallies when the checkpoint was written (absent when it has none). */
  readonly tallies?: Record<string, number>;
}

const rowTables = [
  'deadUnit',
  'deadPhysical',
  'deadLnL',
  'deadLnX',
  'deadLnSlice',
  'deadLiveCount',
  'rankValue',
  'rankOthers',
  'spareUnit',
  'sparePhysical',
  'spareLnL',
] as const;
const liveArrays = ['liveUnit', 'livePhysical', 'liveLnL'] as const;
const scalarNames = [
  'lnXInitial',
  'lnX',
  'lnZDead',
  'steps',
  'evaluations',
  'nonFiniteCount',
  'initialFinite',
  'initialDrawn',
  'replacementsAccepted',
  'replacementEvaluations',
  'recentValid',
  'recentEvaluated',
  'boundBuiltAt',
  'whiteningBuiltAt',
  'chainEvaluations',
  'longestChainEvaluations',
  'elapsedSeconds',
] as const;

export function recordState(state: NestedState): NestedStateRecord {
  const arrays: Record<string, number[]> = {};
  for (const name of liveArrays) arrays[name] = Array.from(state[name]);
  arrays.liveCluster = Array.from(state.liveCluster);
  arrays.clusterLnX = Array.from(state.clusterLnX);
  for (const name of rowTables) arrays[name] = Array.from(state[name].view());
  const scalars: Record<string, number> = {};
  for (const name of scalarNames) scalars[name] = state[name];
  return {
    settings: state.settings,
    arrays,
    scalars,
    streamState: state.stream.stateWords(),
    bound: state.bound === null ? null : recordEllipsoidUnion(state.bound),
    whitenings: state.whitenings === null ? null : state.whitenings.map((w) => Array.from(w)),
    importance: state.importance === null ? null : recordImportanceState(state.importance),
  };
}

export function restoreState(record: NestedStateRecord): NestedState {
  const state = emptyState(record.settings);
  for (const name of liveArrays) state[name].set(record.arrays[name]);
  for (const name of rowTables) {
    const table = state[name];
    const values = record.arrays[name] ?? [];
    for (let offset = 0; offset + table.width <= values.length; offset += table.width) table.push(values, offset);
  }
  // Counters added after the first checkpoints were written start from 0 when missing.
  for (const name of scalarNames) state[name] = record.scalars[name] ?? 0;
  state.stream = SeededStream.fromState(record.streamState);
  state.bound = record.bound === null ? null : restoreEllipsoidUnion(record.bound);
  // Version 1 files predate clusters: one cluster holding every live point.
  if (record.whitenings !== undefined) state.whitenings = record.whitenings === null ? null : record.whitenings.map((w) => Float64Array.from(w));
  else state.whitenings = record.whitening === undefined || record.whitening === null ? null : [Float64Array.from(record.whitening)];
  if (record.arrays.liveCluster !== undefined) state.liveCluster.set(record.arrays.liveCluster);
  state.clusterLnX = Float64Array.from(record.arrays.clusterLnX ?? [state.lnX - state.lnXInitial]);
  if (record.arrays.deadLnSlice === undefined) {
    // Version 1: one cluster, slices from the ln X sequence.
    let lnXBefore = state.lnXInitial;
    for (let i = 0; i < state.deadLnX.count; i++) {
      state.deadLnSlice.pushValue(lnVolumeSlice(lnXBefore, state.deadLiveCount.get(i)));
      lnXBefore = state.deadLnX.get(i);
    }
  }
  state.importance = record.importance === undefined || record.importance === null ? null : restoreImportanceState(record.importance);
  return state;
}
