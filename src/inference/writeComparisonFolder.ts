import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import type { LensSystem } from '../model/lensSystem.js';
import { detectionClaim } from '../results/detectionClaim.js';
import type { Comparison, ComparisonSettings } from './compareModels.js';
import { amplitudePriorText } from './amplitudePriorText.js';
import { writeModelOutputs } from './writeModelOutputs.js';
import { priorCaution } from '../records/cautions.js';
import type { ComparisonSummary } from '../records/comparisonSummary.js';
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
 * Writes a finished comparison into `folder`: smooth/ and perturbed/ (samples, corner data,
 * best-fit images with their misfit alarms) and summary.json last, so a summary exists only for
 * a finished run. The detection claim reads ln B against settings.detectionThresholdLnB (default
 * runDefaults.detection) and the smooth model's misfit alarm (results/detectionClaim.ts).
 */
export function writeComparisonFolder(
  comparison: Comparison, config: ArcsiftConfig, data: ObservedData, folder: string, settings: ComparisonSettings, startedMs: number,
): ComparisonSummary {
  const seed = settings.smooth.seed;
  const smooth = writeModelOutputs(comparison.smooth, config, data, join(folder, 'smooth'), seed);
  const perturbed = writeModelOutputs(comparison.perturbed, config, data, join(folder, 'perturbed'), seed);
  const { onProgress: _a, signal: _b, ...smoothSettings } = settings.smooth;
  const { onProgress: _c, signal: _d, ...perturbedSettings } = settings.perturbed;
  const unfinished = unfinishedRuns([comparison.smooth, comparison.perturbed].map((m) => ({ label: m.label, stopReason: m.result.stopReason })));
  const thresholdLnB = settings.detectionThresholdLnB ?? runDefaults.detection.lnBayesFactorThreshold;
  const claim = detectionClaim({
    lnBayesFactor: comparison.lnBayesFactor, thresholdLnB, smoothMisfit: smooth.misfit.alarm, perturbedMisfit: perturbed.misfit.alarm,
  });
  const summary: ComparisonSummary = {
    kind: 'comparison',
    ...runProvenance(config, data, seed, startedMs, unfinished),
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
    detection: { ...claim, smoothMisfit: smooth.misfit.alarm, perturbedMisfit: perturbed.misfit.alarm },
    perturbers: comparison.perturbers,
    priors: comparison.priors,
    positionPriors: describePositionPriors(comparison.perturbed.system),
    amplitudePrior: amplitudePriorText(config),
    caution: priorCaution,
  };
  writeJsonAtomic(join(folder, 'summary.json'), summary);
  return summary;
}
