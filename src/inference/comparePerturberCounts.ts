import { join } from 'node:path';
import type { ArcsiftConfig, ComponentConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { InputError } from '../errors.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import { bayesFactorReading, thresholdSource } from '../results/index.js';
import { runDefaults } from '../settings/runDefaults.js';
import type { PriorDescription } from '../priors/parameterSpace.js';
import { summarisePerturbers } from './perturberSummary.js';
import { comparisonMethod, runModelEvidence, type EvidenceSettings, type ModelEvidence } from './runModelEvidence.js';
import { writeModelOutputs } from './writeModelOutputs.js';
import { priorCaution } from '../records/cautions.js';
import type { CountComparisonSummary, CountRow } from '../records/countComparisonSummary.js';
import type { ModelRecord } from '../records/modelRecord.js';
import type { PerturberSummary } from '../records/perturberSummary.js';
import { runProvenance } from '../records/provenance.js';
import { qualifiedReading, unfinishedRuns } from '../records/unfinishedRuns.js';

/** The config with exactly `count` perturbers: the listed ones, then copies of the last listed. */
export function withPerturberCount(config: ArcsiftConfig, count: number): ArcsiftConfig {
  if (config.perturbers.length === 0) {
    throw new InputError('comparing perturber counts needs at least one perturber under perturbers (the template)', { file: config.file, key: 'perturbers' });
  }
  const perturbers: ComponentConfig[] = [];
  for (let k = 0; k < count; k++) {
    const template = config.perturbers[Math.min(k, config.perturbers.length - 1)];
    const key = `perturbers[${k}]`;
    const entries = Object.fromEntries(Object.entries(template.entries).map(([name, entry]) => [name, { ...entry, key: `${key}.${name}` }]));
    perturbers.push({ ...template, key, entries });
  }
  return { ...config, perturbers };
}

/**
 * Nested sampling of the models with 0, 1, ..., maxCount perturbers; the preferred count is the
 * one of highest evidence. Identical perturbers are ordered by x (perturberRelabelling), so
 * their labels do not switch. Writes perturbers-K/ folders and summary.json into `folder`.
 */
export async function comparePerturberCounts(
  config: ArcsiftConfig, data: ObservedData, maxCount: number, folder: string,
  settings: EvidenceSettings, onModelStart?: (count: number) => void,
  detectionThresholdLnB: number = runDefaults.detection.lnBayesFactorThreshold,
): Promise<CountComparisonSummary> {
  const started = performance.now();
  const full = withPerturberCount(config, maxCount);
  const runs: ModelEvidence[] = [];
  const method = comparisonMethod(full, maxCount, settings);
  for (let k = 0; k <= maxCount; k++) {
    onModelStart?.(k);
    runs.push(await runModelEvidence(full, data, k, { ...settings, method, checkpointPath: join(folder, `perturbers-${k}`, 'checkpoint.json') }));
  }
  const models = runs.map((run, k) => writeModelOutputs(run, full, data, join(folder, `perturbers-${k}`), settings.seed));
  const stops = runs.map((run, k) => ({ label: `${k} perturber(s)`, stopReason: run.result.stopReason }));
  const rows: CountRow[] = runs.map((run, k) => {
    const toPrevious = k === 0 ? null : run.result.lnZ - runs[k - 1].result.lnZ;
    return {
      perturbers: k,
      lnEvidence: run.result.lnZ,
      lnEvidenceError: run.result.lnZError,
      lnBayesFactorToPrevious: toPrevious,
      lnBayesFactorToSmooth: run.result.lnZ - runs[0].result.lnZ,
      reading: toPrevious === null ? '' : qualifiedReading(bayesFactorReading(toPrevious, `${k} perturbers`, `${k - 1}`).sentence, unfinishedRuns(stops.slice(k - 1, k + 1))),
      relabelled: run.relabelled,
    };
  });
  let preferred = 0;
  for (let k = 1; k < runs.length; k++) if (runs[k].result.lnZ > runs[preferred].result.lnZ) preferred = k;
  let detectedCount = 0;
  while (detectedCount < maxCount && rows[detectedCount + 1].lnBayesFactorToPrevious! > detectionThresholdLnB) detectedCount++;
  const smoothMisfit = models[0].misfit.alarm;
  const sentence = smoothMisfit
    ? 'not evidence of any perturber: the model without perturbers fails the misfit test, so each ln B only says which of two models is less wrong (results/detectionClaim.ts)'
    : `${detectedCount} perturber(s) detected: each count up to ${detectedCount} beats the one below by ln B > ${detectionThresholdLnB}` +
      (detectedCount < maxCount ? `, count ${detectedCount + 1} does not` : '');
  const summary: CountComparisonSummary = {
    kind: 'perturberCount',
    ...runProvenance(config, data, settings.seed, started, unfinishedRuns(stops)),
    rows,
    preferredCount: preferred,
    detection: { thresholdLnB: detectionThresholdLnB, thresholdSource: thresholdSource(detectionThresholdLnB), detectedCount: smoothMisfit ? 0 : detectedCount, smoothMisfit, sentence },
    models,
    perturbers: preferred === 0 ? [] : summarisePerturbers(runs[preferred], ImagePlaneSky.of(data)),
    priors: runs[maxCount].space.describe(),
    labelSwitching: 'identical perturbers are ordered by increasing x inside the prior transform (relabelling); ' +
      'the evidence is unchanged and perturbers[0] is always the leftmost',
    caution: priorCaution,
  };
  writeJsonAtomic(join(folder, 'summary.json'), summary);
  return summary;
}
