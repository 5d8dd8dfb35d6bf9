import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { buildLensSystem, type LensSystem } from '../model/lensSystem.js';
import { LikelihoodPool } from '../parallel/likelihoodPool.js';
import {
  posteriorOnSpace, runEnsemble, type EnsembleProgress, type EnsembleProposalOption, type EnsembleResult, type EnsembleStopRule,
} from '../sampling/ensemble/index.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';
import { configuredStartFraction, posteriorDrawsFile, startAtConfiguredValues, startFromPosterior } from './ensembleStart.js';
import { modelParameterSpace } from '../model/modelParameterSpace.js';
import { runDefaults } from '../settings/runDefaults.js';
import { RunInterrupted } from '../errors.js';
import { refuseAnotherRun, runIdentity } from '../records/runIdentity.js';
import type { InversionRejections } from '../inversion/inversionRejections.js';
import { RejectionTallies } from './rejectionTallies.js';

/** Where the walkers start: draws of an earlier fit's posterior (its folder or a posterior table), or at the config's values. */
export type EnsembleWalkerStart = { readonly posteriorFrom: string } | 'configuredValues';

/** Settings of one ensemble-MCMC run of a lens model. */
export interface EnsembleFitSettings {
  /** Integer seed in [1, 2^32 - 1]. */
  readonly seed: number;
  readonly threads: number;
  /** Even, at least max(4, 2 dim); default max(4, 2 dim + 2). */
  readonly walkers?: number;
  /** Largest number of sweeps (a sweep proposes a move to every walker once). */
  readonly maxSweeps: number;
  /** Stop once every free parameter's R-hat and effective sample sizes meet this rule. */
  readonly stopRule: EnsembleStopRule;
  /** Sweeps between checks of the stop rule (default in runDefaults). */
  readonly checkEverySweeps?: number;
  readonly proposal: EnsembleProposalOption;
  readonly start: EnsembleWalkerStart;
  /** Checkpoint file; with `resume`, an existing one is continued. */
  readonly checkpointPath?: string;
  /** Seconds between checkpoints (default runDefaults.nested.checkpointSeconds, shared by both samplers). */
  readonly checkpointSeconds?: number;
  readonly resume?: boolean;
  readonly onProgress?: (progress: EnsembleProgress) => void;
  readonly signal?: { stopRequested: boolean };
}

/** One model's ensemble run and what is needed to read it. */
export interface ModelEnsemble {
  /** `smooth` (no perturber) or `perturbed` (the config's first perturberCount perturbers). */
  readonly label: string;
  readonly perturberCount: number;
  readonly system: LensSystem;
  readonly space: ParameterSpace;
  readonly result: EnsembleResult;
  readonly stopRule: EnsembleStopRule;
  /** Where the walkers started, in words. */
  readonly start: string;
  readonly seconds: number;
  readonly threads: number;
  /** The pixelated source's likelihoods of minus infinity by reason (null without one), the whole run's. */
  readonly rejections: InversionRejections | null;
}

/** The default walker count for `dim` free parameters: max(4, 2 dim + 2), always even. */
export function defaultWalkerCount(dim: number): number {
  return Math.max(4, 2 * dim + 2);
}

/**
 * Ensemble MCMC of one lens model (smooth when perturberCount = 0) on observed data: the
 * posterior is the log prior plus the pixel log likelihood, evaluated in batches on the worker
 * pool, so a seed fixes the chain whatever the thread count. Checkpoints hold the run's identity
 * (a resume refuses another); a run stopped by `settings.signal` throws RunInterrupted.
 */
export async function runModelEnsemble(
  config: ArcsiftConfig, data: ObservedData, perturberCount: number, settings: EnsembleFitSettings,
): Promise<ModelEnsemble> {
  const system = buildLensSystem(config, { perturberCount });
  const space = modelParameterSpace(system);
  const walkers = settings.walkers ?? defaultWalkerCount(space.dim);
  const from = settings.start;
  const start = from === 'configuredValues' ? startAtConfiguredValues(system, space) : startFromPosterior(from.posteriorFrom, space, walkers);
  const identity = settings.checkpointPath === undefined ? undefined : runIdentity(config, data, settings.seed);
  const started = performance.now();
  const pool = await LikelihoodPool.start({ config, data, perturberCount }, settings.threads);
  const tallies = new RejectionTallies(pool);
  try {
    const result = await runEnsemble({ ...posteriorOnSpace(space, (points, count) => pool.evaluate(points, count)), tallies }, {
      walkers,
      seed: settings.seed,
      start,
      maxSweeps: settings.maxSweeps,
      proposal: settings.proposal,
      stopRule: settings.stopRule,
      checkEverySweeps: settings.checkEverySweeps ?? runDefaults.ensemble.checkEverySweeps,
      checkpoint: settings.checkpointPath === undefined || identity === undefined ? undefined : {
        path: settings.checkpointPath,
        everySeconds: settings.checkpointSeconds ?? runDefaults.nested.checkpointSeconds,
        identity,
        checkIdentity: refuseAnotherRun(identity),
      },
      resume: settings.resume,
      onProgress: settings.onProgress,
      signal: settings.signal,
    });
    if (result.stopped) throw new RunInterrupted(settings.checkpointPath === undefined ? [] : [settings.checkpointPath]);
    return {
      label: perturberCount === 0 ? 'smooth' : 'perturbed',
      perturberCount,
      system,
      space,
      result,
      stopRule: settings.stopRule,
      start: from === 'configuredValues'
        ? `at the config's values (prior median where none), spread by ${configuredStartFraction} of each prior's width (sigma for normal priors)`
        : `posterior draws of ${posteriorDrawsFile(from.posteriorFrom)}`,
      seconds: (performance.now() - started) / 1000,
      threads: pool.threads,
      rejections: system.pixelatedSource === undefined ? null : tallies.counts,
    };
  } finally {
    await pool.close();
  }
}
