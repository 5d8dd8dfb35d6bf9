import { InputError, expectedFound } from '../../errors.js';
import { defaultDifferentialEvolutionGamma } from './differentialEvolutionMove.js';
import { proposalMixture, type EnsembleProposalOption, type ProposalMixture } from './ensembleProposals.js';

/** Where the walkers start: draws of a posterior (a random pick of given points), or a Gaussian around a point. */
export type EnsembleStart =
  | { readonly draws: Float64Array }
  | { readonly around: { readonly center: Float64Array; readonly spread: Float64Array } };

/**
 * When a run has mixed (Vehtari, Gelman, Simpson, Carpenter & Buerkner 2021, sec. 4, whose
 * recommendation this is: R-hat below 1.01, bulk and tail ESS above 400): every free
 * parameter's rank-normalised split R-hat at most `maxRHat` and its bulk and tail effective
 * sample sizes at least `minEffectiveSampleSize`, over the draws after burn-in, walkers taken as
 * chains.
 */
export interface EnsembleStopRule {
  readonly minEffectiveSampleSize: number;
  readonly maxRHat: number;
}

export interface EnsembleProgress {
  /** Sweeps done so far (a sweep proposes a move to every walker once). */
  readonly sweep: number;
  readonly maxSweeps: number;
  /** Log-density evaluations so far, start included. */
  readonly evaluations: number;
  /** Mean over walkers of the acceptance fraction so far. */
  readonly acceptanceFraction: number;
  /** The smallest bulk or tail ESS and the largest R-hat over the parameters at the last check (NaN before one). */
  readonly smallestEffectiveSampleSize: number;
  readonly largestRHat: number;
}

export interface EnsembleOptions {
  /** Number of walkers: even, at least 2 dim and at least 4. */
  readonly walkers: number;
  /** Integer seed in [1, 2^32 - 1]. */
  readonly seed: number;
  readonly start: EnsembleStart;
  /** Largest number of sweeps. */
  readonly maxSweeps: number;
  /** 'stretch' (default), 'differentialEvolution', or a weighted mixture chosen per sweep. */
  readonly proposal?: EnsembleProposalOption;
  /** Stretch scale a of the stretch move (default 2). */
  readonly stretchScale?: number;
  /** Differential-evolution jump scale (default 2.38 / sqrt(2 dim)) and relative jitter (default 1e-3). */
  readonly differentialEvolution?: { readonly gamma?: number; readonly jitter?: number };
  /** Stop once the chain has mixed by this rule (checked every `checkEverySweeps`); absent: run maxSweeps. */
  readonly stopRule?: EnsembleStopRule;
  /** Sweeps between checks of the stop rule (default 100), spaced about 10% apart past 10 intervals (isCheckSweep). */
  readonly checkEverySweeps?: number;
  /** Leading fraction of the stored chain left out of every diagnostic (default 0.5). */
  readonly burnInFraction?: number;
  /** Store every thin-th sweep (default 1). */
  readonly thin?: number;
  /**
   * Write the whole run state to `path` at the end of the first sweep that ends `everySeconds`
   * after the last write, at a stop and at the end. `identity` (plain JSON) is stored with it,
   * and a resume calls `checkIdentity` with the stored one before anything else.
   */
  readonly checkpoint?: {
    readonly path: string;
    readonly everySeconds: number;
    readonly identity?: unknown;
    readonly checkIdentity?: (stored: unknown, file: string) => void;
  };
  /** Continue from the checkpoint file when it exists. */
  readonly resume?: boolean;
  readonly onProgress?: (progress: EnsembleProgress) => void;
  /** Set stopRequested to end the run after the current sweep (state is checkpointed). */
  readonly signal?: { stopRequested: boolean };
}

/** Options after validation, with defaults filled in. */
export interface SettledEnsembleOptions {
  readonly walkers: number;
  readonly seed: number;
  readonly maxSweeps: number;
  readonly proposals: ProposalMixture;
  readonly stretchScale: number;
  readonly gamma: number;
  readonly jitter: number;
  readonly stopRule: EnsembleStopRule | null;
  readonly checkEverySweeps: number;
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

function requiredNumber(what: string, value: unknown, ok: (x: number) => boolean, expected: string): number {
  if (typeof value !== 'number' || !ok(value)) throw new InputError(`ensemble option ${what}: ${expectedFound(expected, value)}`);
  return value;
}

function settleStopRule(rule: EnsembleStopRule | undefined): EnsembleStopRule | null {
  if (rule === undefined) return null;
  return {
    minEffectiveSampleSize: requiredNumber('stopRule.minEffectiveSampleSize', rule.minEffectiveSampleSize,
      (n) => n > 0 && Number.isFinite(n), 'a number > 0'),
    maxRHat: requiredNumber('stopRule.maxRHat', rule.maxRHat, (r) => r > 1 && Number.isFinite(r), 'a number > 1'),
  };
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
  if (options.checkpoint !== undefined) {
    if (typeof options.checkpoint.path !== 'string' || options.checkpoint.path.length === 0) {
      throw new InputError(`ensemble option checkpoint.path: ${expectedFound('a file path', options.checkpoint.path)}`);
    }
    requiredNumber('checkpoint.everySeconds', options.checkpoint.everySeconds, (s) => s > 0, 'a number of seconds > 0');
  }
  return {
    walkers,
    seed,
    maxSweeps: integerAtLeast('maxSweeps', options.maxSweeps, 1),
    proposals: proposalMixture(options.proposal),
    stretchScale: numberIn('stretchScale', options.stretchScale, 2, (a) => a > 1 && Number.isFinite(a), 'a number > 1'),
    gamma: numberIn('differentialEvolution.gamma', options.differentialEvolution?.gamma,
      defaultDifferentialEvolutionGamma(dim), (g) => g > 0 && Number.isFinite(g), 'a number > 0'),
    jitter: numberIn('differentialEvolution.jitter', options.differentialEvolution?.jitter,
      1e-3, (j) => j >= 0 && Number.isFinite(j), 'a number >= 0'),
    stopRule: settleStopRule(options.stopRule),
    checkEverySweeps: options.checkEverySweeps === undefined ? 100 : integerAtLeast('checkEverySweeps', options.checkEverySweeps, 1),
    burnInFraction: numberIn('burnInFraction', options.burnInFraction, 0.5, (f) => f >= 0 && f < 1, 'a number in [0, 1)'),
    thin: options.thin === undefined ? 1 : integerAtLeast('thin', options.thin, 1),
  };
}
