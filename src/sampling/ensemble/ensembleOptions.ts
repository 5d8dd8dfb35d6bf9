import { InputError, expectedFound } from '../../errors.js';
import { defaultDifferentialEvolutionGamma } from './differentialEvolutionMove.js';
import { moveMixture, type EnsembleMoveOption, type MoveMixture } from './ensembleMoves.js';

/** Where the walkers start: a Gaussian ball, or a pick of given points (e.g. nested-sampling draws). */
export type EnsembleStart =
  | { readonly ball: { readonly center: Float64Array; readonly scale: Float64Array } }
  | { readonly points: Float64Array };

export interface EnsembleProgress {
  /** Iterations (ensemble steps) done so far. */
  readonly iteration: number;
  readonly maxSteps: number;
  /** Log-density evaluations so far, start included. */
  readonly evaluations: number;
  /** Mean over walkers of the acceptance fraction so far. */
  readonly acceptanceFraction: number;
  /** Largest autocorrelation time of the last convergence check, in iterations (NaN before one). */
  readonly autocorrelationTimeMax: number;
}

export interface EnsembleOptions {
  /** Number of walkers: even, at least 2 dim and at least 4. */
  readonly walkers: number;
  /** Integer seed in [1, 2^32 - 1]. */
  readonly seed: number;
  readonly start: EnsembleStart;
  /** Largest number of iterations (each moves every walker once). */
  readonly maxSteps: number;
  /** 'stretch' (default), 'differentialEvolution', or a weighted mixture chosen per iteration. */
  readonly move?: EnsembleMoveOption;
  /** Stretch scale a of the stretch move (default 2). */
  readonly stretchScale?: number;
  /** Differential-evolution jump scale (default 2.38 / sqrt(2 dim)) and relative jitter (default 1e-3). */
  readonly differentialEvolution?: { readonly gamma?: number; readonly jitter?: number };
  /**
   * Stop once the retained iterations exceed this many times the largest autocorrelation time
   * and every parameter's tau changed by less than `autocorrelationTolerance` since the last check.
   */
  readonly targetAutocorrelationTimes?: number;
  /** Relative change of tau between checks counted as stable (default 0.01). */
  readonly autocorrelationTolerance?: number;
  /** Iterations between convergence checks (default 100). */
  readonly checkEvery?: number;
  /** Leading fraction of the stored chain left out of every diagnostic (default 0.5). */
  readonly burnInFraction?: number;
  /** Store every thin-th iteration (default 1). */
  readonly thin?: number;
  /** Write the whole run state to `path` every `everySteps` iterations, at a stop and at the end. */
  readonly checkpoint?: { readonly path: string; readonly everySteps: number };
  /** Continue from the checkpoint file when it exists. */
  readonly resume?: boolean;
  readonly onProgress?: (progress: EnsembleProgress) => void;
  /** Set stopRequested to end the run after the current iteration (state is checkpointed). */
  readonly signal?: { stopRequested: boolean };
}

/** Options after validation, with defaults filled in. */
export interface SettledEnsembleOptions {
  readonly walkers: number;
  readonly seed: number;
  readonly maxSteps: number;
  readonly moves: MoveMixture;
  readonly stretchScale: number;
  readonly gamma: number;
  readonly jitter: number;
  readonly targetAutocorrelationTimes: number | null;
  readonly autocorrelationTolerance: number;
  readonly checkEvery: number;
  readonly burnInFraction: number;
  readonly thin: number;
}

function integerAtLeast(what: string, value: unknown, least: number): number {
  if (typeof value !== 'number' || !Number.isInteger(value) || value < least) {
    throw new InputError(`ensemble option ${what}: ${expectedFound(`an integer >= ${least}`, value)}`);
  }
  return value;
}

function numberIn(what: string, value: unknown, fallback: number, ok: (x: number) => boolean, expected: string): number {
  if (value === undefined) return fallback;
  if (typeof value !== 'number' || !ok(value)) {
    throw new InputError(`ensemble option ${what}: ${expectedFound(expected, value)}`);
  }
  return value;
}

export function settleEnsembleOptions(dim: number, options: EnsembleOptions): SettledEnsembleOptions {
  integerAtLeast('dim', dim, 1);
  const walkers = integerAtLeast('walkers', options.walkers, Math.max(4, 2 * dim));
  if (walkers % 2 !== 0) {
    throw new InputError(`ensemble option walkers: ${expectedFound('an even number', walkers)}`);
  }
  const seed = options.seed;
  if (!Number.isInteger(seed) || seed < 1 || seed > 0xffffffff) {
    throw new InputError(`ensemble option seed: ${expectedFound('an integer from 1 to 4294967295', seed)}`);
  }
  const target = options.targetAutocorrelationTimes;
  if (options.checkpoint !== undefined) {
    if (typeof options.checkpoint.path !== 'string' || options.checkpoint.path.length === 0) {
      throw new InputError(`ensemble option checkpoint.path: ${expectedFound('a file path', options.checkpoint.path)}`);
    }
    integerAtLeast('checkpoint.everySteps', options.checkpoint.everySteps, 1);
  }
  return {
    walkers,
    seed,
    maxSteps: integerAtLeast('maxSteps', options.maxSteps, 1),
    moves: moveMixture(options.move),
    stretchScale: numberIn('stretchScale', options.stretchScale, 2, (a) => a > 1 && Number.isFinite(a), 'a number > 1'),
    gamma: numberIn('differentialEvolution.gamma', options.differentialEvolution?.gamma,
      defaultDifferentialEvolutionGamma(dim), (g) => g > 0 && Number.isFinite(g), 'a number > 0'),
    jitter: numberIn('differentialEvolution.jitter', options.differentialEvolution?.jitter,
      1e-3, (j) => j >= 0 && Number.isFinite(j), 'a number >= 0'),
    targetAutocorrelationTimes: target === undefined ? null
      : numberIn('targetAutocorrelationTimes', target, 50, (n) => n > 0 && Number.isFinite(n), 'a number > 0'),
    autocorrelationTolerance: numberIn('autocorrelationTolerance', options.autocorrelationTolerance,
      0.01, (t) => t > 0 && Number.isFinite(t), 'a number > 0'),
    checkEvery: options.checkEvery === undefined ? 100 : integerAtLeast('checkEvery', options.checkEvery, 1),
    burnInFraction: numberIn('burnInFraction', options.burnInFraction, 0.5, (f) => f >= 0 && f < 1, 'a number in [0, 1)'),
    thin: options.thin === undefined ? 1 : integerAtLeast('thin', options.thin, 1),
  };
}
