import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import { packageVersion } from '../records/packageVersion.js';
import type { LensSystem } from '../model/lensSystem.js';
import { compareModels, favouredLnBayesFactor, type Comparison, type ComparisonSettings } from './compareModels.js';
import { amplitudePriorText } from './amplitudePriorText.js';
import { writeModelOutputs, type ModelRecord } from './writeModelOutputs.js';

/** The caution printed and written beside every Bayes factor. */
export const priorCaution =
  'The Bayes factor and the perturber mass depend on the priors and on the model family (mass profiles, ' +
  'source model, PSF and noise model) listed here; a detection deserves a check with a more flexible source ' +
  'model (e.g. shapelets) and other reasonable priors before it is published.';

/** The summary.json of a comparison run. */
export interface ComparisonSummary {
  readonly arcsiftVersion: string;
  readonly kind: 'comparison';
  readonly config: string;
  readonly configSha256: string;
  readonly data: ObservedData['files'];
  readonly dataNotices: readonly string[];
  readonly seed: number;
  readonly settings: Record<string, unknown>;
  readonly runSeconds: number;
  readonly models: { readonly smooth: ModelRecord; readonly perturbed: ModelRecord };
  readonly bayesFactor: {
    readonly lnBayesFactor: number;
    readonly lnBayesFactorError: number;
    readonly reading: string;
    readonly kassRafteryGrade: string;
    readonly significance: string;
    readonly pValueBound: number | null;
    readonly sigmaBound: number | null;
    readonly perturberFavoured: boolean;
    readonly favouredAbove: number;
  };
  readonly perturbers: Comparison['perturbers'];
  readonly priors: Comparison['priors'];
  /** Region priors on perturber positions, where given (they replace the box of the x and y priors). */
  readonly positionPriors: readonly { readonly key: string; readonly region: string }[];
  readonly amplitudePrior: string;
  readonly caution: string;
}

/** sha256 of the config file's bytes (or of its validated content when there is no file). */
export function configHash(config: ArcsiftConfig): string {
  let bytes: Buffer | string;
  try {
    bytes = readFileSync(config.file);
  } catch {
    bytes = JSON.stringify(config);
  }
  return createHash('sha256').update(bytes).digest('hex');
}

/** Plain words for each perturber's region prior. */
export function describePositionPriors(system: LensSystem): { key: string; region: string }[] {
  return system.perturbers.filter((p) => p.positionPrior !== undefined).map((p) => {
    const r = p.positionPrior!;
    return {
      key: p.key,
      region: r.region === 'mask'
        ? 'uniform over the used pixels of the mask'
        : `uniform over the disc of radius ${r.radiusArcsec}" centred at (${r.centerXArcsec}", ${r.centerYArcsec}")`,
    };
  });
}

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

/**
 * Runs `compareModels` and writes everything into `folder`: smooth/ and perturbed/ (samples,
 * corner data, best-fit images, checkpoints) and summary.json last, so a summary exists only for
 * a finished run.
 */
export async function runComparisonToFolder(
  config: ArcsiftConfig, data: ObservedData, folder: string, settings: ComparisonSettings,
): Promise<{ comparison: Comparison; summary: ComparisonSummary }> {
  const started = performance.now();
  const withCheckpoints: ComparisonSettings = {
    ...settings,
    smooth: { ...settings.smooth, checkpointPath: join(folder, 'smooth', 'checkpoint.json') },
    perturbed: { ...settings.perturbed, checkpointPath: join(folder, 'perturbed', 'checkpoint.json') },
  };
  const comparison = await compareModels(config, data, withCheckpoints);
  const seed = settings.smooth.seed;
  const smooth = writeModelOutputs(comparison.smooth, config, data, join(folder, 'smooth'), seed);
  const perturbed = writeModelOutputs(comparison.perturbed, config, data, join(folder, 'perturbed'), seed);
  const { onProgress: _a, signal: _b, ...smoothSettings } = settings.smooth;
  const { onProgress: _c, signal: _d, ...perturbedSettings } = settings.perturbed;
  const summary: ComparisonSummary = {
    arcsiftVersion: packageVersion(),
    kind: 'comparison',
    config: config.file,
    configSha256: configHash(config),
    data: data.files,
    dataNotices: data.notices,
    seed,
    settings: { smooth: smoothSettings, perturbed: perturbedSettings, perturberCount: settings.perturberCount ?? 1 },
    runSeconds: (performance.now() - started) / 1000,
    models: { smooth, perturbed },
    bayesFactor: {
      lnBayesFactor: comparison.lnBayesFactor,
      lnBayesFactorError: comparison.lnBayesFactorError,
      reading: comparison.reading.sentence,
      kassRafteryGrade: comparison.reading.grade,
      significance: comparison.significance.reading,
      pValueBound: finiteOrNull(comparison.significance.pValue),
      sigmaBound: finiteOrNull(comparison.significance.sigma),
      perturberFavoured: comparison.perturberFavoured,
      favouredAbove: favouredLnBayesFactor,
    },
    perturbers: comparison.perturbers,
    priors: comparison.priors,
    positionPriors: describePositionPriors(comparison.perturbed.system),
    amplitudePrior: amplitudePriorText(config),
    caution: priorCaution,
  };
  writeJsonAtomic(join(folder, 'summary.json'), summary);
  return { comparison, summary };
}
