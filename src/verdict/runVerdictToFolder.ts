import { join } from 'node:path';
import type { ObservedData } from '../data/observedData.js';
import type { SmoothFamily, VerdictConfig } from '../config/verdictConfig.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import { amplitudePriorText } from '../inference/amplitudePriorText.js';
import type { EvidenceSettings } from '../inference/runModelEvidence.js';
import { writeComparisonFolder } from '../inference/writeComparisonFolder.js';
import { verdictCaution } from '../records/cautions.js';
import type { ComparisonSummary } from '../records/comparisonSummary.js';
import type { ModelRecord } from '../records/modelRecord.js';
import { runProvenance } from '../records/provenance.js';
import { unfinishedRuns } from '../records/unfinishedRuns.js';
import type { VerdictFamilyRecord, VerdictFitRecord, VerdictSummary } from '../records/verdictSummary.js';
import { runDefaults } from '../settings/runDefaults.js';
import { compareFamilies, type FamilyComparison, type FamilyModel, type FamilySettings } from './compareFamilies.js';
import { familyComponents } from './familyComponents.js';
import { familySuggestions } from './familySuggestions.js';
import { VERDICT_LIMITS, VERDICT_RULE, robustVerdict } from './robustVerdict.js';

/** Settings of a verdict run. */
export interface VerdictSettings extends FamilySettings {
  /** The detection threshold in ln B (default runDefaults.detection.lnBayesFactorThreshold). */
  readonly detectionThresholdLnB?: number;
}

/** A family's compare folder, relative to the verdict's folder. */
export function familyFolder(family: Pick<SmoothFamily, 'slug'>): string {
  return join('families', family.slug);
}

const fitRecord = (m: ModelRecord): VerdictFitRecord => ({ lnEvidence: m.lnEvidence, lnEvidenceError: m.lnEvidenceError, stopReason: m.stopReason, misfit: m.misfit });

/** What verdict.json lists of one family's finished comparison. */
function familyRecord(family: SmoothFamily, summary: ComparisonSummary): VerdictFamilyRecord {
  const components = familyComponents(family.config);
  return {
    name: family.name,
    key: family.key,
    folder: familyFolder(family),
    replaces: family.replaces,
    components: { lens: components.lens, source: components.source },
    smooth: fitRecord(summary.models.smooth),
    perturbed: fitRecord(summary.models.perturbed),
    lnBayesFactor: summary.bayesFactor.lnBayesFactor,
    lnBayesFactorError: summary.bayesFactor.lnBayesFactorError,
    reading: summary.bayesFactor.reading,
    claim: { claim: summary.detection.claim, thresholdLnB: summary.detection.thresholdLnB, thresholdSource: summary.detection.thresholdSource, sentence: summary.detection.sentence },
    acceptable: !summary.models.smooth.misfit.alarm,
    perturbers: summary.perturbers,
    priors: summary.priors,
    positionPriors: summary.positionPriors,
  };
}

/**
 * The robust verdict in one call: every family's smooth and perturbed nested fits
 * (compareFamilies, side by side on shared worker threads), each written as a compare folder
 * under `folder`/families/<slug>/ (smooth/, perturbed/, summary.json; checkpoints there, so an
 * interrupted verdict resumes run by run with `resume`), then the verdict over them
 * (robustVerdict.ts) and verdict.json last, so it exists only for a finished verdict.
 */
export async function runVerdictToFolder(
  verdictConfig: VerdictConfig, data: ObservedData, folder: string, settings: VerdictSettings,
): Promise<{ families: FamilyComparison[]; summary: VerdictSummary }> {
  const started = performance.now();
  const { families } = verdictConfig;
  const perturberCount = settings.perturberCount ?? 1;
  const thresholdLnB = settings.detectionThresholdLnB ?? runDefaults.detection.lnBayesFactorThreshold;
  // Each run's settings are asked for once (the caller's function may start a progress printer).
  const runSettings = new Map<string, EvidenceSettings>();
  for (const family of families) {
    for (const model of ['smooth', 'perturbed'] as const) {
      runSettings.set(`${family.key}/${model}`, { ...settings.evidence(family, model), checkpointPath: join(folder, familyFolder(family), model, 'checkpoint.json') });
    }
  }
  const evidence = (family: SmoothFamily, model: FamilyModel): EvidenceSettings => runSettings.get(`${family.key}/${model}`)!;
  const compared = await compareFamilies(families, data, { ...settings, evidence });
  const summaries = compared.map(({ family, comparison }) => writeComparisonFolder(
    comparison, family.config, data, join(folder, familyFolder(family)),
    { smooth: evidence(family, 'smooth'), perturbed: evidence(family, 'perturbed'), perturberCount, detectionThresholdLnB: thresholdLnB },
    started,
  ));
  const records = families.map((family, k) => familyRecord(family, summaries[k]));
  const verdict = robustVerdict(
    records.map((r) => ({
      name: r.name, lnBayesFactor: r.lnBayesFactor, lnBayesFactorError: r.lnBayesFactorError, smoothLnEvidence: r.smooth.lnEvidence,
      smoothMisfit: r.smooth.misfit.alarm, perturbedMisfit: r.perturbed.misfit.alarm,
      converged: r.smooth.stopReason === 'converged' && r.perturbed.stopReason === 'converged',
    })),
    thresholdLnB,
    familySuggestions(families.map((f) => familyComponents(f.config))),
  );
  const unfinished = unfinishedRuns(records.flatMap((r) => (['smooth', 'perturbed'] as const).map((m) => ({ label: `${r.name} / ${m}`, stopReason: r[m].stopReason }))));
  const first = evidence(families[0], 'smooth');
  const { onProgress: _a, signal: _b, checkpointPath: _c, ...plain } = first;
  const summary: VerdictSummary = {
    kind: 'verdict',
    ...runProvenance(verdictConfig.base, data, first.seed, started, unfinished),
    settings: { ...plain, perturberCount, detectionThresholdLnB: thresholdLnB },
    families: records,
    verdict,
    rule: VERDICT_RULE,
    limits: VERDICT_LIMITS,
    amplitudePrior: amplitudePriorText(verdictConfig.base),
    caution: verdictCaution,
  };
  writeJsonAtomic(join(folder, 'verdict.json'), summary);
  return { families: compared, summary };
}
