import { InputError, expectedFound } from '../errors.js';

/**
 * Every default of an arcsift run, in one frozen object: the commands, the demo, the benchmarks
 * and the library read them here (and settleRunSettings validates a caller's overrides of them),
 * so a number is changed in one place.
 */
export interface RunSettings {
  /** Nested sampling of `fit`, `compare` and `vet` (and of a lens model through the library). */
  readonly nested: {
    readonly livePoints: number;
    readonly seed: number;
    /** 'auto' (multi-ellipsoid bounds for small smooth models with enough live points, slice sampling otherwise; lensModelMethod), 'ellipsoids' or 'slice'. */
    readonly method: 'auto' | 'ellipsoids' | 'slice';
    /**
     * Live points replaced per step: fixed, never tied to the thread count, so results do not
     * depend on it (6 of 25 lost the main mode of the demo's 13-parameter perturbed model).
     */
    readonly replacementsPerStep: number;
    /** Slice moves per new live point, per free parameter. */
    readonly sliceStepsPerParameter: number;
    /** Stop when the live points could add less than this to ln Z. */
    readonly lnZTolerance: number;
    /** Seconds between checkpoints of a run's state (the ensemble sampler's too). */
    readonly checkpointSeconds: number;
    /**
     * Where ln Z comes from: 'nested' (the nested-sampling sum) or 'importance' (importance
     * sampling from a proposal learned from the nested run, sampling/importance/; off by default
     * until measured on the lens models, see README).
     */
    readonly evidence: 'nested' | 'importance';
  };
  /** The demo's quick settings (its ln Z errors are about 1; see README). */
  readonly demo: {
    readonly livePoints: number;
    readonly sliceStepsPerParameter: number;
    readonly noiseSeed: number;
  };
  /** Ensemble MCMC of `fit --sampler ensemble`. */
  readonly ensemble: {
    /** Largest number of sweeps (a sweep proposes a move to every walker once). */
    readonly maxSweeps: number;
    /**
     * Stop once every free parameter's bulk and tail effective sample size reach this and its
     * R-hat is at most maxRHat (Vehtari et al. 2021 recommend 400 and 1.01).
     */
    readonly minEffectiveSampleSize: number;
    readonly maxRHat: number;
    /** Sweeps between checks of that rule. */
    readonly checkEverySweeps: number;
    readonly proposal: 'stretch' | 'differentialEvolution';
    /** Live points of the short nested run whose posterior draws the walkers start from. */
    readonly startLivePoints: number;
  };
  /** Vetting of network flags (a flag is confirmed above detection.lnBayesFactorThreshold). */
  readonly vet: {
    /** Side of the square position prior around each flag, arcsec. */
    readonly windowArcsec: number;
    readonly disfavourBelowLnB: number;
    /** Smallest map value that makes a candidate. */
    readonly mapThreshold: number;
    /** Map peaks closer than this (arcsec) to a higher one are merged into it. */
    readonly mergeRadiusArcsec: number;
  };
  /** Sensitivity maps. */
  readonly sensitivity: {
    /** Live points of the short nested run that finds the smooth best fit. */
    readonly livePoints: number;
    readonly gridSize: number;
    /** Detected when Delta chi^2 / 2 reaches this (5: Delta chi^2 = 10). */
    readonly threshold: number;
    /** Bisection in log10 mass stops at this width, dex. */
    readonly toleranceDex: number;
    /** Local Nelder-Mead refit of the smooth model: initial step as a fraction of each prior's width, evaluations, stop. */
    readonly refitStepFraction: number;
    readonly refitMaxEvaluations: number;
    readonly refitChiSquareTolerance: number;
  };
  /** The comparison's plain-words reading: the perturber is favoured above this ln B. */
  readonly comparison: {
    readonly favouredLnBayesFactor: number;
  };
  /** The misfit alarm on normalised residuals (results/residualAutocorrelation.ts). */
  readonly misfitAlarm: {
    readonly neighbours: 'rook' | 'queen';
    readonly permutations: number;
    /** Sounds when the permutation p-value is at or below this: its rate on white noise (exact, 999 permutations). */
    readonly falseAlarmRate: number;
    readonly seed: number;
  };
  /** The detection claim of compare, vet and verdict (results/detectionClaim.ts). */
  readonly detection: {
    /**
     * A perturber is detected when ln B exceeds this (and the smooth model passes the misfit
     * alarm): 50, the robust-detection threshold of Vegetti et al. 2014 and Ritondale et al. 2019
     * (10 sigma; see DETECTION_THRESHOLD_SOURCE).
     */
    readonly lnBayesFactorThreshold: number;
  };
  /** Batch runs of many rows (locally or as a Slurm job array). */
  readonly batch: {
    /** Attempts of a row that fails (not one killed from outside) before it is left failed. */
    readonly maxAttempts: number;
    /** A running row touches its lock this often; a lock untouched for staleSeconds is taken as dead. */
    readonly heartbeatSeconds: number;
    readonly staleSeconds: number;
    /** Rows run one after the other by one Slurm array task. */
    readonly rowsPerTask: number;
    /** Slurm --time per task: measured seconds per row times this, plus slurmMarginMinutes. */
    readonly slurmTimeFactor: number;
    readonly slurmMarginMinutes: number;
    /** Slurm memory per task: measured peak resident memory of a row times this. */
    readonly slurmMemoryFactor: number;
    /** Seconds between progress lines when not on a terminal. */
    readonly progressSeconds: number;
  };
  /** Simulation-based calibration of a config's inference. */
  readonly calibration: {
    /** Posterior draws L per simulation: the rank of the truth among them takes L + 1 values (Talts et al. 2018). */
    readonly rankDraws: number;
    /** A comparison counts as a detection here when ln B exceeds this (not the detection claim's threshold, see detection). */
    readonly detectAboveLnB: number;
    /** Seed of the prior draws and of the noise of each simulation. */
    readonly seed: number;
  };
}

type Section = keyof RunSettings;

function deepFreeze<T extends object>(value: T): T {
  for (const inner of Object.values(value)) if (typeof inner === 'object' && inner !== null) deepFreeze(inner);
  return Object.freeze(value);
}

export const runDefaults: RunSettings = deepFreeze({
  nested: {
    livePoints: 200, seed: 1, method: 'auto', replacementsPerStep: 2, sliceStepsPerParameter: 2, lnZTolerance: 0.1,
    checkpointSeconds: 30, evidence: 'importance',
  },
  demo: { livePoints: 50, sliceStepsPerParameter: 1, noiseSeed: 1 },
  ensemble: { maxSweeps: 5000, minEffectiveSampleSize: 400, maxRHat: 1.01, checkEverySweeps: 100, proposal: 'stretch', startLivePoints: 50 },
  vet: { windowArcsec: 0.4, disfavourBelowLnB: -1, mapThreshold: 0.5, mergeRadiusArcsec: 0.15 },
  sensitivity: {
    livePoints: 50, gridSize: 10, threshold: 5, toleranceDex: 0.05,
    refitStepFraction: 0.01, refitMaxEvaluations: 400, refitChiSquareTolerance: 1e-3,
  },
  comparison: { favouredLnBayesFactor: 1 },
  misfitAlarm: { neighbours: 'rook', permutations: 999, falseAlarmRate: 0.01, seed: 1 },
  detection: { lnBayesFactorThreshold: 50 },
  batch: {
    maxAttempts: 3, heartbeatSeconds: 10, staleSeconds: 90, rowsPerTask: 1,
    slurmTimeFactor: 2, slurmMarginMinutes: 10, slurmMemoryFactor: 1.5, progressSeconds: 10,
  },
  calibration: { rankDraws: 99, detectAboveLnB: 3, seed: 1 },
} satisfies RunSettings);

/** What each setting may hold: a whole number of at least `min`, a number above or at least `min`, or one of `choices`. */
type Rule = { readonly whole: number } | { readonly above: number } | { readonly atLeast: number } | { readonly any: true } | { readonly choices: readonly string[] };

const rules: { readonly [S in Section]: { readonly [K in keyof RunSettings[S]]: Rule } } = {
  nested: {
    livePoints: { whole: 2 }, seed: { whole: 1 }, method: { choices: ['auto', 'ellipsoids', 'slice'] },
    replacementsPerStep: { whole: 1 }, sliceStepsPerParameter: { above: 0 }, lnZTolerance: { above: 0 }, checkpointSeconds: { above: 0 },
    evidence: { choices: ['nested', 'importance'] },
  },
  demo: { livePoints: { whole: 2 }, sliceStepsPerParameter: { above: 0 }, noiseSeed: { whole: 1 } },
  ensemble: {
    maxSweeps: { whole: 1 }, minEffectiveSampleSize: { above: 0 }, maxRHat: { above: 1 }, checkEverySweeps: { whole: 1 },
    proposal: { choices: ['stretch', 'differentialEvolution'] }, startLivePoints: { whole: 2 },
  },
  vet: { windowArcsec: { above: 0 }, disfavourBelowLnB: { any: true }, mapThreshold: { above: 0 }, mergeRadiusArcsec: { atLeast: 0 } },
  sensitivity: {
    livePoints: { whole: 2 }, gridSize: { whole: 1 }, threshold: { above: 0 }, toleranceDex: { above: 0 },
    refitStepFraction: { above: 0 }, refitMaxEvaluations: { whole: 1 }, refitChiSquareTolerance: { above: 0 },
  },
  comparison: { favouredLnBayesFactor: { any: true } },
  misfitAlarm: { neighbours: { choices: ['rook', 'queen'] }, permutations: { whole: 1 }, falseAlarmRate: { above: 0 }, seed: { whole: 1 } },
  detection: { lnBayesFactorThreshold: { any: true } },
  batch: {
    maxAttempts: { whole: 1 }, heartbeatSeconds: { above: 0 }, staleSeconds: { above: 0 }, rowsPerTask: { whole: 1 },
    slurmTimeFactor: { atLeast: 1 }, slurmMarginMinutes: { atLeast: 0 }, slurmMemoryFactor: { atLeast: 1 }, progressSeconds: { above: 0 },
  },
  calibration: { rankDraws: { whole: 1 }, detectAboveLnB: { any: true }, seed: { whole: 1 } },
};

/** Overrides of some settings of some sections. */
export type RunSettingsOverrides = { readonly [S in Section]?: Partial<RunSettings[S]> };

/** Why a value breaks its rule, or undefined when it keeps it. */
function broken(value: unknown, rule: Rule): string | undefined {
  if ('choices' in rule) return rule.choices.includes(value as string) ? undefined : `one of ${rule.choices.join(', ')}`;
  if (typeof value !== 'number' || !Number.isFinite(value)) return 'a finite number';
  if ('whole' in rule) return Number.isInteger(value) && value >= rule.whole ? undefined : `a whole number >= ${rule.whole}`;
  if ('above' in rule) return value > rule.above ? undefined : `a number > ${rule.above}`;
  if ('atLeast' in rule) return value >= rule.atLeast ? undefined : `a number >= ${rule.atLeast}`;
  return undefined;
}

/**
 * The defaults with a caller's overrides, each checked against its rule (a whole number, a
 * positive number, one of a list), frozen. A bad or unknown setting is an InputError naming it
 * as `section.name`.
 */
export function settleRunSettings(overrides: RunSettingsOverrides = {}): RunSettings {
  const settled: Record<string, Record<string, unknown>> = {};
  for (const section of Object.keys(runDefaults) as Section[]) {
    const given = (overrides[section] ?? {}) as Record<string, unknown>;
    const sectionRules = rules[section] as Record<string, Rule>;
    for (const name of Object.keys(given)) {
      if (!(name in sectionRules)) {
        throw new InputError(`no such setting (known: ${Object.keys(sectionRules).join(', ')})`, { key: `${section}.${name}` });
      }
      if (given[name] === undefined) continue;
      const expected = broken(given[name], sectionRules[name]);
      if (expected !== undefined) throw new InputError(expectedFound(expected, given[name]), { key: `${section}.${name}` });
    }
    const defined = Object.fromEntries(Object.entries(given).filter(([, v]) => v !== undefined));
    settled[section] = { ...runDefaults[section], ...defined };
  }
  return deepFreeze(settled as unknown as RunSettings);
}
