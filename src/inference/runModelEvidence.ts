import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { buildLensSystem, type LensSystem } from '../model/lensSystem.js';
import type { BatchOccupancy } from '../parallel/batchOccupancy.js';
import { LikelihoodPool, type ModelPool } from '../parallel/likelihoodPool.js';
import { runNested, type EvidenceMethod, type ImportanceOptions, type NestedMethod, type NestedProgress, type NestedResult } from '../sampling/nested/index.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';
import { modelParameterSpace } from '../model/modelParameterSpace.js';
import { modelPriorTransform } from '../model/modelPriorTransform.js';
import { runDefaults } from '../settings/runDefaults.js';
import { RunInterrupted } from '../errors.js';
import { refuseAnotherRun, runIdentity } from '../records/runIdentity.js';
import type { InversionRejections } from '../inversion/inversionRejections.js';
import { RejectionTallies } from './rejectionTallies.js';

/** Settings of one nested-sampling run of a lens model. */
export interface EvidenceSettings {
  readonly livePoints: number;
  readonly seed: number;
  readonly method: NestedMethod;
  /** Live points replaced per step (see runDefaults.nested.replacementsPerStep). */
  readonly replacementsPerStep: number;
  readonly lnZTolerance: number;
  /** Slice moves per new live point, per free parameter (slice sampling; default in runDefaults). */
  readonly sliceStepsPerParameter?: number;
  /** Slice moves per new live point in all; overrides sliceStepsPerParameter when given. */
  readonly sliceSteps?: number;
  /**
   * Points each slice chain sends per likelihood call (speculative slice sampling, exact for any
   * value; default 1); fixed, never tied to the thread count, so results do not depend on it.
   */
  readonly slicePointsPerChain?: number;
  readonly maxEvaluations?: number;
  /** Where ln Z comes from (default runDefaults.nested.evidence). */
  readonly evidence?: EvidenceMethod;
  /** Settings of the importance-sampling stage (defaults in sampling/importance/importanceSettings.ts). */
  readonly importance?: ImportanceOptions;
  readonly threads: number;
  /** Evaluate in worker threads even with one thread, so that several runs can go side by side. */
  readonly inWorker?: boolean;
  /** Checkpoint file; with `resume`, an existing one is continued. */
  readonly checkpointPath?: string;
  /** Seconds between checkpoints (default in runDefaults). */
  readonly checkpointSeconds?: number;
  readonly resume?: boolean;
  readonly onProgress?: (progress: NestedProgress) => void;
  readonly signal?: { stopRequested: boolean };
}

/** One model's nested-sampling run and what is needed to read it. */
export interface ModelEvidence {
  /** `smooth` (no perturber) or `perturbed` (the config's first perturberCount perturbers). */
  readonly label: string;
  readonly perturberCount: number;
  readonly system: LensSystem;
  readonly space: ParameterSpace;
  readonly result: NestedResult;
  readonly seconds: number;
  readonly threads: number;
  /** True when identical perturbers were ordered by x to remove label switching. */
  readonly relabelled: boolean;
  /** The pixelated source's likelihoods of minus infinity by reason (null without one), the whole run's. */
  readonly rejections: InversionRejections | null;
  /** Batch sizes of the run's likelihood calls through the pool (slice chains run in workers are not calls). */
  readonly occupancy: BatchOccupancy;
  /** Messages sent to worker threads (runs of points and slice chains; 0 on one thread). */
  readonly messages: number;
}

/**
 * The constrained-draw method for a lens model. 'auto' takes multi-ellipsoid bounds only for a
 * smooth model of at most 8 free parameters with at least 10 live points per parameter: with a
 * perturber the likelihood has a plateau (any position at low mass fits as well as the smooth
 * model) joined to a narrow peak, which the bootstrap-grown ellipsoids bound poorly (an
 * efficiency several times below slice sampling's), and with fewer live points per parameter
 * the bootstrap grows the bounds until slice sampling needs fewer evaluations (DEVELOPERS.md,
 * measured choices).
 */
export function lensModelMethod(requested: NestedMethod, dim: number, perturberCount: number, livePoints: number): NestedMethod {
  if (requested !== 'auto') return requested;
  return perturberCount === 0 && dim <= 8 && livePoints >= ELLIPSOID_LIVE_POINTS_PER_PARAMETER * dim ? 'ellipsoids' : 'slice';
}

/** Live points per free parameter below which 'auto' takes slice sampling for a smooth model. */
export const ELLIPSOID_LIVE_POINTS_PER_PARAMETER = 10;

/**
 * The one constrained-draw method for every run of a comparison, from its richest model (the
 * config with `perturberCount` perturbers): a Bayes factor between runs made with different
 * methods carries the difference of their biases (several nats on one model; DEVELOPERS.md,
 * measured choices).
 */
export function comparisonMethod(config: ArcsiftConfig, perturberCount: number, settings: Pick<EvidenceSettings, 'method' | 'livePoints'>): NestedMethod {
  const dim = modelParameterSpace(buildLensSystem(config, { perturberCount })).dim;
  return lensModelMethod(settings.method, dim, perturberCount, settings.livePoints);
}

/** A prior transform applied after the model's own, built once the model's parameter space is known. */
export type ExtraTransform = (system: LensSystem, space: ParameterSpace) => (unit: Float64Array, out: Float64Array) => void;

/**
 * Nested sampling of one lens model (smooth when perturberCount = 0) on observed data. `extra`
 * names the run (default `smooth` or `perturbed`) and may add a prior transform that overwrites
 * parts of the physical vector (the map prior on a perturber's position does). With a
 * checkpoint, the run's identity (config, data files, seed, version) goes into it and a resume
 * refuses another; a run stopped by `settings.signal` throws RunInterrupted once its last
 * checkpoint is written.
 */
export async function runModelEvidence(
  config: ArcsiftConfig, data: ObservedData, perturberCount: number, settings: EvidenceSettings,
  extra: {
    readonly label?: string;
    readonly transform?: ExtraTransform;
    /** A pool shared with other runs, holding this model (settings.threads is then its own). */
    readonly pool?: ModelPool;
  } = {},
): Promise<ModelEvidence> {
  const system = buildLensSystem(config, { perturberCount });
  const space = modelParameterSpace(system);
  const additional = extra.transform?.(system, space);
  const prior = modelPriorTransform(system, space, data, additional);
  const identity = settings.checkpointPath === undefined ? undefined : runIdentity(config, data, settings.seed);
  const started = performance.now();
  const own = extra.pool === undefined
    ? await LikelihoodPool.start({ config, data, perturberCount }, settings.threads, { inWorker: settings.inWorker })
    : undefined;
  const pool: ModelPool = extra.pool ?? own!;
  if (pool.width !== system.parameters.length) {
    throw new RangeError(`runModelEvidence: the pool's model has ${pool.width} parameters, this one ${system.parameters.length}`);
  }
  const tallies = new RejectionTallies(pool);
  try {
    const result = await runNested(
      {
        tallies,
        dim: space.dim,
        physicalDim: space.physicalDim,
        transform: prior.transform,
        periodic: space.periodic,
        logLikelihood: (points, count) => pool.evaluate(points, count),
        // Chains run in the workers, next to the likelihood, unless a transform of the caller's
        // own (which a worker cannot rebuild) is part of the prior.
        runSliceChain: pool.inWorkers && additional === undefined ? (request, stop) => pool.runSliceChain(request, stop) : undefined,
        idleThreads: () => pool.idleThreads,
      },
      {
        livePoints: settings.livePoints,
        seed: settings.seed,
        method: lensModelMethod(settings.method, space.dim, perturberCount, settings.livePoints),
        slice: {
          steps: settings.sliceSteps ?? Math.max(1, Math.round((settings.sliceStepsPerParameter ?? runDefaults.nested.sliceStepsPerParameter) * space.dim)),
          pointsPerChain: settings.slicePointsPerChain,
        },
        replacementsPerStep: settings.replacementsPerStep,
        lnZTolerance: settings.lnZTolerance,
        maxEvaluations: settings.maxEvaluations,
        evidence: settings.evidence ?? runDefaults.nested.evidence,
        importance: settings.importance,
        checkpoint: settings.checkpointPath === undefined || identity === undefined ? undefined : {
          path: settings.checkpointPath,
          everySeconds: settings.checkpointSeconds ?? runDefaults.nested.checkpointSeconds,
          identity,
          checkIdentity: refuseAnotherRun(identity),
        },
        resume: settings.resume,
        onProgress: settings.onProgress,
        signal: settings.signal,
      },
    );
    if (result.stopReason === 'interrupted') throw new RunInterrupted(settings.checkpointPath === undefined ? [] : [settings.checkpointPath]);
    return {
      label: extra.label ?? (perturberCount === 0 ? 'smooth' : 'perturbed'),
      perturberCount,
      system,
      space,
      result,
      seconds: (performance.now() - started) / 1000,
      threads: pool.threads,
      relabelled: prior.relabelled,
      rejections: system.pixelatedSource === undefined ? null : tallies.counts,
      occupancy: pool.occupancy,
      messages: pool.messages,
    };
  } finally {
    await own?.close();
  }
}
