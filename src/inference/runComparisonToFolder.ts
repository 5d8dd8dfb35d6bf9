import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import type { LensSystem } from '../model/lensSystem.js';
import { compareModels, type Comparison, type ComparisonSettings } from './compareModels.js';
import { amplitudePriorText } from './amplitudePriorText.js';
import { writeModelOutputs } from './writeModelOutputs.js';
import { priorCaution } from '../records/cautions.js';
import type { ComparisonSummary } from '../records/comparisonSummary.js';
import type { ModelRecord } from '../records/modelRecord.js';
import { runProvenance } from '../records/provenance.js';
import { qualifiedReading, unfinishedRuns } from '../records/unfinishedRuns.js';
import { runDefaults } from '../settings/runDefaults.js';

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
  const unfinished = unfinishedRuns([comparison.smooth, comparison.perturbed].map((m) => ({ label: m.label, stopReason: m.result.stopReason })));
  const summary: ComparisonSummary = {
    kind: 'comparison',
    ...runProvenance(config, data, seed, started, unfinished),
    settings: { smooth: smoothSettings, perturbed: perturbedSettings, perturberCount: settings.perturberCount ?? 1 },
    models: { smooth, perturbed },
    bayesFactor: {
      lnBayesFactor: comparison.lnBayesFactor,
      lnBayesFactorError: comparison.lnBayesFactorError,
      reading: qualifiedReading(comparison.reading.sentence, unfinished),
      kassRafteryGrade: comparison.reading.grade,
      significance: comparison.significance.reading,
      pValueBound: finiteOrNull(comparison.significance.pValue),
      sigmaBound: finiteOrNull(comparison.significance.sigma),
      perturberFavoured: comparison.perturberFavoured,
      favouredAbove: runDefaults.comparison.favouredLnBayesFactor,
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
