import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { buildLensSystem, type LensSystem } from '../model/lensSystem.js';
import { LikelihoodPool } from '../parallel/likelihoodPool.js';
import {
  posteriorOnSpace, runEnsemble, type EnsembleMoveOption, type EnsembleProgress, type EnsembleResult,
} from '../sampling/ensemble/index.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';
import { ballAroundConfiguredValues, startFromSamples, startSamplesFile } from './ensembleStart.js';
import { modelParameterSpace } from '../model/modelParameterSpace.js';
import { runDefaults } from '../settings/runDefaults.js';

/** Settings of one ensemble-MCMC run of a lens model. */
export interface EnsembleFitSettings {
  /** Integer seed in [1, 2^32 - 1]. */
  readonly seed: number;
  readonly threads: number;
  /** Even, at least max(4, 2 dim); default max(4, 2 dim + 2). */
  readonly walkers?: number;
  /** Largest number of iterations. */
  readonly maxSteps: number;
  /** Stop once the chain after burn-in is longer than this many autocorrelation times (and they are stable). */
  readonly targetAutocorrelationTimes: number;
  readonly move: EnsembleMoveOption;
  /** Start from the draws in this posterior table, or in a fit folder's posterior-draws.csv or walker-paths.csv; default a ball around the config's values. */
  readonly startFrom?: string;
  /** Checkpoint file, written every `checkpointEverySteps` iterations; with `resume`, an existing one is continued. */
  readonly checkpointPath?: string;
  readonly checkpointEverySteps?: number;
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
  /** Where the walkers started, in words. */
  readonly start: string;
  readonly seconds: number;
  readonly threads: number;
}

/** The default walker count for `dim` free parameters: max(4, 2 dim + 2), always even. */
export function defaultWalkerCount(dim: number): number {
  return Math.max(4, 2 * dim + 2);
}

/**
 * Ensemble MCMC of one lens model (smooth when perturberCount = 0) on observed data: the
 * posterior is the log prior plus the pixel log likelihood, evaluated in batches on the worker
 * pool, so a seed fixes the chain whatever the thread count.
 */
export async function runModelEnsemble(
  config: ArcsiftConfig, data: ObservedData, perturberCount: number, settings: EnsembleFitSettings,
): Promise<ModelEnsemble> {
  const system = buildLensSystem(config, { perturberCount });
  const space = modelParameterSpace(system);
  const walkers = settings.walkers ?? defaultWalkerCount(space.dim);
  const start = settings.startFrom === undefined
    ? ballAroundConfiguredValues(system, space)
    : startFromSamples(settings.startFrom, space, walkers);
  const started = performance.now();
  const pool = await LikelihoodPool.start({ config, data, perturberCount }, settings.threads);
  try {
    const result = await runEnsemble(posteriorOnSpace(space, (points, count) => pool.evaluate(points, count)), {
      walkers,
      seed: settings.seed,
      start,
      maxSteps: settings.maxSteps,
      move: settings.move,
      targetAutocorrelationTimes: settings.targetAutocorrelationTimes,
      checkpoint: settings.checkpointPath === undefined ? undefined
        : { path: settings.checkpointPath, everySteps: settings.checkpointEverySteps ?? runDefaults.ensemble.checkpointEverySteps },
      resume: settings.resume,
      onProgress: settings.onProgress,
      signal: settings.signal,
    });
    return {
      label: perturberCount === 0 ? 'smooth' : 'perturbed',
      perturberCount,
      system,
      space,
      result,
      start: settings.startFrom === undefined
        ? 'a Gaussian ball around the config\'s values (prior median where none), 1e-3 of each prior\'s width (sigma for normal priors)'
        : `draws of ${startSamplesFile(settings.startFrom)}`,
      seconds: (performance.now() - started) / 1000,
      threads: pool.threads,
    };
  } finally {
    await pool.close();
  }
}
