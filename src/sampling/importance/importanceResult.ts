import { importanceEstimate, type ImportanceEstimate } from './importanceEstimate.js';
import { stageLnWeights, type ImportanceStageSummary, type ImportanceState } from './importanceState.js';
import { recordStudentMixture, type StudentMixtureRecord } from './studentMixture.js';

/** z-score beyond which two estimates of one ln Z are said to disagree. */
export const disagreementZ = 3;

/** The evidence from the importance-sampling stage of a run, and how far to trust it. */
export interface ImportanceResult {
  /** ln Z and its error from the final stage's draws alone. */
  readonly lnZ: number;
  readonly lnZError: number;
  /** the final stage's weights: draws, effective sample size, largest weight share, Pareto k-hat. */
  readonly final: ImportanceEstimate;
  /** likelihood evaluations of all stages (adaptation and final). */
  readonly evaluations: number;
  readonly stages: readonly ImportanceStageSummary[];
  /** the final proposal (frame coordinates: unit coordinates shifted by `seams`, see periodicSeams). */
  readonly proposal: StudentMixtureRecord;
  readonly seams: readonly number[];
  /**
   * Self-checks: (ln Z_final - ln Z_other) / sqrt(err_final^2 + err_other^2) against the adaptation
   * stage that drew from the same proposal (independent draws: a tail too heavy for the quoted
   * error shows as disagreement) and against the nested-sampling estimate.
   */
  readonly repeatZ: number;
  readonly nestedZ: number;
  /**
   * the importance estimate itself is in doubt: the Pareto k-hat is above its limit, or repeatZ
   * beyond disagreementZ.
   */
  readonly suspect: boolean;
  /**
   * |nestedZ| beyond disagreementZ: the nested-sampling sum disagrees. With few slice steps the
   * nested sum is biased while the importance estimate, whose draws do not depend on the nested
   * run's volume estimates, is not; a reader sees both.
   */
  readonly nestedDisagrees: boolean;
  /** the final stage's draws inside the cube: unit and physical rows, ln L, ln(L pi / q) normalised to sum 1. */
  readonly samples: {
    readonly count: number;
    readonly unitPoints: Float64Array;
    readonly points: Float64Array;
    readonly lnL: Float64Array;
    readonly lnWeight: Float64Array;
  };
}

function zScore(a: number, errorA: number, b: number, errorB: number): number {
  const spread = Math.hypot(errorA, errorB);
  return spread > 0 && Number.isFinite(spread) ? (a - b) / spread : Number.NaN;
}

/** The result of a completed importance stage; `nested` is the nested-sampling estimate it is checked against. */
export function importanceResultOf(state: ImportanceState, nested: { readonly lnZ: number; readonly lnZError: number }): ImportanceResult {
  const lnW = stageLnWeights(state);
  const final = importanceEstimate(lnW);
  const last = state.history[state.history.length - 1];
  const twin = state.history
    .filter((h) => h.stage > 0)
    .reduce<ImportanceStageSummary | null>((best, h) => (best === null || h.effectiveSampleSize / h.draws > best.effectiveSampleSize / best.draws ? h : best), null);
  const repeatZ = twin === null ? Number.NaN : zScore(last.lnZ, last.lnZError, twin.lnZ, twin.lnZError);
  const nestedZ = zScore(final.lnZ, final.lnZError, nested.lnZ, nested.lnZError);
  const count = state.lnL.count;
  const lnWeight = Float64Array.from(lnW.subarray(0, count), (v) => v - final.lnZ - Math.log(final.draws));
  return {
    lnZ: final.lnZ,
    lnZError: final.lnZError,
    final,
    evaluations: state.evaluations,
    stages: state.history.map((h) => ({ ...h })),
    proposal: recordStudentMixture(state.proposal),
    seams: Array.from(state.seams),
    repeatZ,
    nestedZ,
    suspect: final.paretoShape > final.paretoShapeLimit || Math.abs(repeatZ) > disagreementZ,
    nestedDisagrees: Math.abs(nestedZ) > disagreementZ,
    samples: {
      count,
      unitPoints: state.unit.view().slice(),
      points: state.physical.view().slice(),
      lnL: state.lnL.view().slice(),
      lnWeight,
    },
  };
}
