import { InputError, expectedFound } from '../../errors.js';

/** How the importance-sampling stage runs (see runImportance); part of a run's settings. */
export interface ImportanceSettings {
  /** draws of each adaptation stage. */
  readonly drawsPerStage: number;
  /** adaptation stages at most. */
  readonly maxStages: number;
  /** the final stage draws enough for this ln Z error, as predicted from the best adaptation stage ... */
  readonly targetLnZError: number;
  /** ... within [drawsPerStage, maxFinalDraws]. */
  readonly maxFinalDraws: number;
  /** Student-t degrees of freedom of the proposal's components (an integer >= 1). */
  readonly dof: number;
  /** each component's scale matrix is its fitted covariance times this. */
  readonly scale: number;
  /** share of the uniform (defensive) component, in [0, 1). */
  readonly defensive: number;
  /** share of the wide copies of the fitted components (see learnProposal), in [0, 1). */
  readonly wide: number;
  readonly maxComponents: number;
}

/** The settings a caller may override (each checked by resolveImportanceSettings). */
export type ImportanceOptions = Partial<ImportanceSettings>;

/**
 * Defaults, from `npm run bench -- evidence` and the tuning runs quoted in the commit that set
 * them: 2000 draws a stage and at most 4 stages reach an effective sample size of 10-40% of the
 * draws on the 20-dimensional Gaussian shells, the 10-dimensional twisted Gaussian and the demo's
 * perturbed lens model; Student-t components with 5 degrees of freedom at the fitted covariance
 * keep the weights' Pareto k-hat below 0.5 there.
 */
export const defaultImportanceSettings: ImportanceSettings = Object.freeze({
  drawsPerStage: 2000,
  maxStages: 4,
  targetLnZError: 0.05,
  maxFinalDraws: 40000,
  dof: 5,
  scale: 1,
  defensive: 0.02,
  wide: 0.1,
  maxComponents: 10,
});

function wholeAtLeast(value: number, minimum: number, key: string): number {
  if (!Number.isInteger(value) || value < minimum) {
    throw new InputError(`importance sampling ${key}: ${expectedFound(`an integer >= ${minimum}`, value)}`);
  }
  return value;
}

/** The defaults with a caller's overrides, each checked (an InputError names the key). */
export function resolveImportanceSettings(options: ImportanceOptions = {}): ImportanceSettings {
  const settings = { ...defaultImportanceSettings, ...Object.fromEntries(Object.entries(options).filter(([, v]) => v !== undefined)) };
  for (const key of Object.keys(options)) {
    if (!(key in defaultImportanceSettings)) {
      throw new InputError(`importance sampling: no setting named ${JSON.stringify(key)} (known: ${Object.keys(defaultImportanceSettings).join(', ')})`);
    }
  }
  wholeAtLeast(settings.drawsPerStage, 10, 'drawsPerStage');
  wholeAtLeast(settings.maxStages, 1, 'maxStages');
  wholeAtLeast(settings.maxFinalDraws, settings.drawsPerStage, 'maxFinalDraws');
  wholeAtLeast(settings.dof, 1, 'dof');
  wholeAtLeast(settings.maxComponents, 1, 'maxComponents');
  if (!(settings.targetLnZError > 0) || !Number.isFinite(settings.targetLnZError)) {
    throw new InputError(`importance sampling targetLnZError: ${expectedFound('a number > 0', settings.targetLnZError)}`);
  }
  if (!(settings.scale > 0) || !Number.isFinite(settings.scale)) {
    throw new InputError(`importance sampling scale: ${expectedFound('a number > 0', settings.scale)}`);
  }
  for (const key of ['defensive', 'wide'] as const) {
    if (!(settings[key] >= 0 && settings[key] < 1)) {
      throw new InputError(`importance sampling ${key}: ${expectedFound('a number in [0, 1)', settings[key])}`);
    }
  }
  return Object.freeze(settings);
}
