import type { RunTallies } from '../runTallies.js';

/**
 * Batch log density: `points` holds `count` free-parameter vectors row-major (count x dim);
 * returns at least `count` log densities (unnormalised is fine). May return a Promise, so the
 * caller can spread the batch over worker threads. Non-finite values mean "reject". The sampler
 * reuses `points` for the next batch once the call has returned (or its Promise has settled).
 */
export type BatchLogDensity = (
  points: Float64Array, count: number,
) => Promise<Float64Array> | Float64Array;

/** Period of a periodic free parameter: values are kept in [lower, upper). */
export interface PeriodicRange {
  readonly lower: number;
  readonly upper: number;
}

export interface EnsembleProblem {
  /** Number of free parameters. */
  readonly dim: number;
  readonly logPosterior: BatchLogDensity;
  /** Per free dimension, its period or null (absent: none periodic). */
  readonly periodic?: ReadonlyArray<PeriodicRange | null>;
  /** Optional counts of the likelihood's side, stored in the checkpoints (see RunTallies). */
  readonly tallies?: RunTallies;
}
