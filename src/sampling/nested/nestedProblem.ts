import type { RunTallies } from '../runTallies.js';
import type { InsertionRankCheck } from './insertionRank.js';
import type { ImportanceOptions } from '../importance/importanceSettings.js';
import type { ImportanceResult } from '../importance/importanceResult.js';
import type { SliceChainRequest, SliceChainResult } from './sliceChain.js';

/**
 * A problem for the nested sampler, posed on the unit hypercube [0, 1]^dim: `transform` maps a
 * unit-cube point to the physical point handed to the likelihood (the prior is uniform on the cube
 * before the transform).
 */
export interface NestedProblem {
  /** dimensions of the unit cube (free parameters). */
  readonly dim: number;
  /** length of a physical point handed to the likelihood. */
  readonly physicalDim: number;
  /** unit-cube point -> physical point; must not keep references to either buffer. */
  transform(unit: Float64Array, out: Float64Array): void;
  /** unit coordinates that wrap (angles); used by slice sampling, ignored by ellipsoids. */
  readonly periodic?: readonly boolean[];
  /**
   * ln L of `count` physical points stored row-major in `points` (row length physicalDim). May
   * be asynchronous (a worker pool). NaN and +-Infinity mark impossible points. The sampler owns
   * `points` and reuses it after the call: copy it before keeping or transferring it.
   */
  logLikelihood(points: Float64Array, count: number): Promise<Float64Array> | Float64Array;
  /**
   * Optional, slice sampling: runs one whole chain where the likelihood lives (a worker thread
   * holding this problem's transform and likelihood) and answers as runSliceChain would here. The
   * sampler then sends one message per chain instead of one per point; the result is the same.
   * `stop`, if given, is an Int32Array on a SharedArrayBuffer: once its first entry is set, the
   * chain ends before its next evaluation and the call rejects (an early chain not needed).
   */
  runSliceChain?(request: SliceChainRequest, stop?: Int32Array): Promise<SliceChainResult>;
  /**
   * Optional, with runSliceChain: how many threads are idle now. When one is while a step's last
   * chain runs, the next step's chains start early (EarlyChains in earlyChains.ts); the result is
   * the same, only sooner.
   */
  idleThreads?(): number;
  /** Optional counts of the likelihood's side, stored in the checkpoints (see RunTallies). */
  readonly tallies?: RunTallies;
}

/** How constrained draws are made. 'auto': ellipsoids for dim <= autoEllipsoidMaxDim, slice above. */
export type NestedMethod = 'auto' | 'ellipsoids' | 'slice';

/**
 * Where ln Z comes from: 'nested', the nested-sampling sum itself; 'importance', importance
 * sampling from a proposal learned from the nested run (runImportance), the nested run then only
 * finding and bounding the posterior.
 */
export type EvidenceMethod = 'nested' | 'importance';

/** Why the run stopped. */
export type NestedStopReason = 'converged' | 'maxIterations' | 'maxEvaluations' | 'interrupted';

export interface NestedProgress {
  /** dead points so far. */
  readonly iteration: number;
  /** ln of the evidence accumulated from dead points. */
  readonly lnZ: number;
  /** ln(X_i * max live L), the estimate of what the live points can still add. */
  readonly lnZRemaining: number;
  /** accepted replacements per likelihood evaluation so far (initial draws excluded). */
  readonly efficiency: number;
  readonly evaluations: number;
  readonly elapsedSeconds: number;
}

export interface NestedCheckpointOptions {
  /** JSON file written atomically at step boundaries. */
  readonly path: string;
  readonly everySeconds?: number;
  readonly everyIterations?: number;
  /** The caller's record of what the run was made from (plain JSON), stored in every checkpoint. */
  readonly identity?: unknown;
  /** Called on resume with the stored identity (undefined when none) before the state is read; throws to refuse. */
  readonly checkIdentity?: (stored: unknown, file: string) => void;
}

export interface NestedOptions {
  /** number of live points N; default runDefaults.nested.livePoints. */
  readonly livePoints?: number;
  /** integer in [1, 2^32 - 1]; default 1. */
  readonly seed?: number;
  readonly method?: NestedMethod;
  /**
   * k live points replaced per step in one batch, default 1. Slice sampling runs k chains side by
   * side, so k at least the number of worker threads keeps them busy; results depend on (seed, k),
   * never on timing, so choose a fixed k, not one that follows the thread count.
   */
  readonly replacementsPerStep?: number;
  /** stop when ln(Z + Z_live) - ln Z < this; default 0.1. */
  readonly lnZTolerance?: number;
  readonly maxEvaluations?: number;
  /** maximum number of dead points. */
  readonly maxIterations?: number;
  /** ellipsoid volume enlargement factor, >= 1; default defaultEnlargement. */
  readonly enlargement?: number;
  /**
   * slice sampling: `steps` slice moves per new point, default 5 * dim; `pointsPerChain` points
   * each chain evaluates per likelihood call (speculative stepping out and shrinkage, exact for
   * any value), default 1. Like replacementsPerStep it is part of the random sequence: set it
   * to a fixed number, never to the thread count. `clusters`: chains move within clusters of the
   * live points, each with its own volume and whitening (liveClusters.ts); default on with
   * evidence 'importance', off with 'nested' (off, a run is bit for bit as before clusters).
   */
  readonly slice?: { readonly steps?: number; readonly pointsPerChain?: number; readonly clusters?: boolean };
  /** how ln Z is estimated; default runDefaults.nested.evidence. */
  readonly evidence?: EvidenceMethod;
  /** settings of the importance-sampling stage (evidence 'importance'); defaults in importanceSettings.ts. */
  readonly importance?: ImportanceOptions;
  readonly checkpoint?: NestedCheckpointOptions;
  /** continue from checkpoint.path when the file exists. */
  readonly resume?: boolean;
  /** called once every livePoints dead points and at the end. */
  readonly onProgress?: (progress: NestedProgress) => void;
  /** cooperative interruption: checked at every step boundary. */
  readonly signal?: { stopRequested: boolean };
  /**
   * Test hook only: multiply every bounding ellipsoid's volume by this factor (< 1 gives a
   * deliberately biased sampler, for checking the insertion-rank test). Default 1.
   */
  readonly boundVolumeFactorForTesting?: number;
}

export interface NestedResult {
  /** ln of the evidence by `evidenceMethod`: the importance estimate, or the nested one (nestedLnZ). */
  readonly lnZ: number;
  /** its error: the importance estimate's, or the nested one's (nestedLnZError). */
  readonly lnZError: number;
  /** 'importance' when the importance stage ran to its end, else 'nested'. */
  readonly evidenceMethod: EvidenceMethod;
  /** ln of the evidence from nested sampling: dead points plus the final live points. */
  readonly nestedLnZ: number;
  /**
   * Skilling's sqrt(H / N); when initial draws hit impossible points, the relative error
   * sqrt((1 - f) / N) of the finite prior fraction f is added in quadrature.
   */
  readonly nestedLnZError: number;
  /** the importance stage's estimate, diagnostics and draws (null unless evidenceMethod is 'importance'). */
  readonly importance: ImportanceResult | null;
  /** standard deviation of ln Z over 200 simulated shrinkage sequences (Higson et al. 2018). */
  readonly lnZErrorSimulated: number;
  /** information H (nats), the posterior's KL divergence from the prior. */
  readonly information: number;
  /** dead points (final live points not included). */
  readonly iterations: number;
  /** likelihood evaluations of the whole run (nested and importance stages). */
  readonly evaluations: number;
  readonly efficiency: number;
  /**
   * Slice sampling: evaluations of all chains over those of each step's longest chain, summed
   * over steps; the speed-up of k threads, one per chain, if every point cost the same (1 for
   * ellipsoids). A deterministic measure of how well the chains can share a worker pool.
   */
  readonly chainParallelism: number;
  /**
   * Slice chains in worker threads: chains of a step started before it (see earlyChains.ts) and
   * used, and dropped because the step turned out otherwise (their evaluations are not counted
   * in `evaluations`). Timing decides these counts, never the result.
   */
  readonly earlyChains: { readonly used: number; readonly discarded: number };
  readonly nonFiniteCount: number;
  /** physical points, rows of physicalDim: all dead points, then the final live points by ascending ln L. */
  readonly points: Float64Array;
  /** the same points on the unit cube, rows of dim. */
  readonly unitPoints: Float64Array;
  readonly count: number;
  readonly lnL: Float64Array;
  /** ln of the prior volume enclosed by each point's contour. */
  readonly lnX: Float64Array;
  /** normalised posterior log weights (sum of exp = 1). */
  readonly lnWeight: Float64Array;
  /** live points present when each point was removed (the final live points: N, N - 1, ..., 1); for merging runs. */
  readonly liveCount: Float64Array;
  /** each new live point's insertion rank and how many it was ranked among (see insertionRankTest); for merging runs. */
  readonly insertionRanks: { readonly rank: Float64Array; readonly others: Float64Array };
  readonly insertionRank: InsertionRankCheck;
  readonly method: 'ellipsoids' | 'slice';
  readonly stopReason: NestedStopReason;
  readonly livePoints: number;
  /** equal-weight posterior samples (physical rows); count defaults to the effective sample size. */
  equalWeight(count?: number, seed?: number): Float64Array;
}
