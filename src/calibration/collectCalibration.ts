import type { DetectionClaimKind } from '../results/detectionClaim.js';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { batchStatus } from '../batch/batchStatus.js';
import { csvField } from '../io/csvField.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import { derivedSeed } from '../numeric/random/derivedSeed.js';
import { SeededStream } from '../numeric/random/seededStream.js';
import { weightsFromLogWeights } from '../numeric/statistics/weightsFromLogWeights.js';
import type { CalibrationDrawRecord, CalibrationParameterRecord, CalibrationSummary } from '../records/calibrationSummary.js';
import type { ComparisonSummary } from '../records/comparisonSummary.js';
import type { NestedFitSummary } from '../records/fitSummary.js';
import type { ModelRecord } from '../records/modelRecord.js';
import { packageVersion } from '../io/packageVersion.js';
import { configuredCosmology } from '../cosmology/configuredCosmology.js';
import { readWeightedPosterior } from '../records/readWeightedPosterior.js';
import { POSTERIOR_TABLES } from '../records/posteriorTables.js';
import type { CalibrationDraw, CalibrationDrawsRecord } from './calibrationDraws.js';
import { detectionRates, type DrawDetection } from './detectionRates.js';
import { coverageCurve, intervalCoverage } from './intervalCoverage.js';
import { posteriorCdfAt, posteriorDrawIndices, rankOfTruth, type WeightedPosterior } from './posteriorRank.js';
import { rankUniformity } from './rankUniformity.js';

/** One finished draw as the calibration uses it: the true model's posterior and reported intervals, ln B. */
export interface DrawPosterior {
  readonly draw: CalibrationDraw;
  readonly posterior: WeightedPosterior;
  /** The run's reported parameters (median, 68% and 95% intervals) by name. */
  readonly intervals: ReadonlyMap<string, { readonly unit: string; readonly interval68: readonly [number, number]; readonly interval95: readonly [number, number] }>;
  readonly lnBayesFactor: number | null;
  /** The comparison's own detection claim (absent in summaries written before it existed; null for a fit). */
  readonly claim?: DetectionClaimKind | null;
  /** The ln B threshold of that claim. */
  readonly claimThresholdLnB?: number | null;
  readonly stopReason: string;
}

/** Where one draw's truth falls in its posterior, per parameter. */
export interface TruthPlacementRow {
  readonly draw: string;
  readonly parameter: string;
  readonly truth: number;
  readonly rank: number;
  readonly cdf: number;
  readonly in68: boolean;
  readonly in95: boolean;
}

/**
 * Ranks, posterior CDF values and interval coverage of every parameter over the draws (the
 * statistics of simulation-based calibration, Talts et al. 2018), whatever produced the
 * posteriors: each draw's L = rankDraws posterior draws come from a stream seeded by its noise
 * seed and `seed`, so a draw's ranks do not change when other draws are added.
 */
export function calibrationStatistics(draws: readonly DrawPosterior[], rankDraws: number, seed: number): { parameters: CalibrationParameterRecord[]; rows: TruthPlacementRow[] } {
  const rows: TruthPlacementRow[] = [];
  const indices = new Int32Array(rankDraws);
  const units = new Map<string, string>();
  draws.forEach((d) => {
    posteriorDrawIndices(d.posterior.weights, rankDraws, SeededStream.fromSeed(derivedSeed(d.draw.noiseSeed, seed)), indices);
    for (const [name, truth] of Object.entries(d.draw.truth)) {
      const column = d.posterior.names.indexOf(name);
      const reported = d.intervals.get(name);
      if (column < 0 || reported === undefined) continue;
      units.set(name, reported.unit);
      rows.push({
        draw: d.draw.id, parameter: name, truth,
        rank: rankOfTruth(d.posterior, column, indices, truth),
        cdf: posteriorCdfAt(d.posterior, column, truth),
        in68: truth >= reported.interval68[0] && truth <= reported.interval68[1],
        in95: truth >= reported.interval95[0] && truth <= reported.interval95[1],
      });
    }
  });
  const names = [...new Set(rows.map((r) => r.parameter))];
  const parameters = names.map((name): CalibrationParameterRecord => {
    const mine = rows.filter((r) => r.parameter === name);
    const u = rankUniformity(mine.map((r) => r.rank), mine.map((r) => r.cdf), rankDraws);
    return {
      name, unit: units.get(name) ?? '', draws: mine.length, rankDraws,
      rankHistogram: u.histogram, chiSquare: u.chiSquare, chiSquarePValue: u.chiSquarePValue, ksStatistic: u.ksStatistic, ksPValue: u.ksPValue,
      coverage68: intervalCoverage(mine.map((r) => r.in68)),
      coverage95: intervalCoverage(mine.map((r) => r.in95)),
      coverageCurve: coverageCurve(mine.map((r) => r.cdf)),
    };
  });
  return { parameters, rows };
}

function modelPosterior(samplesFile: string, record: ModelRecord): Pick<DrawPosterior, 'posterior' | 'intervals' | 'stopReason'> {
  const table = readWeightedPosterior(samplesFile);
  const posterior: WeightedPosterior = {
    names: table.names, dim: table.names.length, count: table.lnWeight.length, points: table.points, weights: weightsFromLogWeights(table.lnWeight),
  };
  const intervals = new Map(record.parameters.map((p) => [p.name, { unit: p.unit, interval68: p.interval68, interval95: p.interval95 }]));
  return { posterior, intervals, stopReason: record.stopReason };
}

/** A finished row's posterior of the draw's true model: the perturbed or smooth model of a comparison, or the fit's. */
export function readDrawPosterior(rowFolder: string, draw: CalibrationDraw): DrawPosterior {
  const summary = JSON.parse(readFileSync(join(rowFolder, 'summary.json'), 'utf8')) as ComparisonSummary | NestedFitSummary;
  if (summary.kind === 'comparison') {
    const model = draw.withPerturber ? 'perturbed' : 'smooth';
    return {
      draw, ...modelPosterior(join(rowFolder, model, `${POSTERIOR_TABLES.weighted}.csv`), summary.models[model]),
      lnBayesFactor: summary.bayesFactor.lnBayesFactor, claim: summary.detection?.claim ?? null,
      claimThresholdLnB: summary.detection?.thresholdLnB ?? null,
    };
  }
  return { draw, ...modelPosterior(join(rowFolder, `${POSTERIOR_TABLES.weighted}.csv`), summary.model), lnBayesFactor: null, claim: null };
}

/** What the calibration takes as given, stated in calibration.json and the report. */
export const CALIBRATION_ASSUMPTIONS: readonly string[] = [
  'Each draw takes every sampled parameter from its prior through the fit\'s own prior transform (region priors and perturber ordering included) and simulates it with simulate\'s noise model.',
  'Light amplitudes are held at the config\'s values in every draw, while the fits integrate them out under their Gaussian prior: the ranks test the sampled parameters given data whose amplitudes the likelihood pins down, not the amplitude prior.',
  'Ranks use L independent draws from each run\'s weighted posterior samples; a run cut short (stop reason other than converged) enters as it stands and is counted.',
];

export interface CollectSettings {
  readonly out: string;
  readonly config: ArcsiftConfig;
  readonly draws: CalibrationDrawsRecord;
  readonly job: 'fit' | 'compare';
  readonly runOptions: readonly string[];
  readonly rankDraws: number;
  readonly detectAboveLnB: number;
  readonly maxAttempts?: number;
}

/**
 * Collects a calibration folder: every finished draw's posterior (batch/rows/ID), the ranks,
 * coverage and detection figures, written to calibration.json and calibration-ranks.csv
 * (atomically; again at every call, with the draws finished by then). Returns the summary.
 */
export function collectCalibration(settings: CollectSettings): CalibrationSummary {
  const { out, config, draws: record } = settings;
  const batchFolder = join(out, 'batch');
  const status = existsSync(join(batchFolder, 'batch.json')) ? batchStatus(batchFolder, { maxAttempts: settings.maxAttempts }) : null;
  const stateOf = new Map((status?.rows ?? []).map((r) => [r.id, r]));
  const finished: DrawPosterior[] = [];
  for (const draw of record.draws) {
    const row = stateOf.get(draw.id);
    if (row?.state === 'finished') finished.push(readDrawPosterior(row.folder, draw));
  }
  const { parameters, rows } = calibrationStatistics(finished, settings.rankDraws, record.seed);
  const massParameter = config.perturbers.length === 0 ? null : `${config.perturbers[0].key}.log10MassSolar`;
  const massPrior = config.perturbers[0]?.entries.log10MassSolar?.prior;
  const massRange: [number, number] | null = massPrior !== undefined && 'lower' in massPrior && 'upper' in massPrior ? [massPrior.lower, massPrior.upper] : null;
  const massOf = (draw: CalibrationDraw): number | null => (massParameter !== null && draw.withPerturber ? draw.truth[massParameter] ?? null : null);
  const detections: DrawDetection[] = finished.filter((d) => d.lnBayesFactor !== null)
    .map((d) => ({ lnBayesFactor: d.lnBayesFactor as number, withPerturber: d.draw.withPerturber, log10Mass: massOf(d.draw), claim: d.claim ?? null, claimThresholdLnB: d.claimThresholdLnB ?? null }));
  const perDraw: CalibrationDrawRecord[] = record.draws.map((draw) => {
    const row = stateOf.get(draw.id);
    const done = finished.find((d) => d.draw.id === draw.id);
    return {
      id: draw.id, withPerturber: draw.withPerturber, state: row?.state ?? 'waiting', lnBayesFactor: done?.lnBayesFactor ?? null,
      truthLog10Mass: massOf(draw), stopReason: done?.stopReason ?? null, seconds: row?.seconds ?? 0,
    };
  });
  const seconds = perDraw.reduce((s, d) => s + d.seconds, 0);
  const summary: CalibrationSummary = {
    kind: 'calibration',
    arcsiftVersion: packageVersion(),
    config: record.config,
    configSha256: record.configSha256,
    title: config.title,
    job: settings.job,
    seed: record.seed,
    cosmology: configuredCosmology(config).record,
    runOptions: settings.runOptions,
    rankDraws: settings.rankDraws,
    draws: {
      planned: record.draws.length,
      finished: finished.length,
      withPerturber: finished.filter((d) => d.draw.withPerturber).length,
      withoutPerturber: finished.filter((d) => !d.draw.withPerturber).length,
      stoppedEarly: finished.filter((d) => d.stopReason !== 'converged').length,
      failed: perDraw.filter((d) => d.state === 'failed').length,
    },
    parameters,
    detection: settings.job === 'compare' && detections.length > 0 ? detectionRates(detections, settings.detectAboveLnB, massRange, 0.5, massParameter) : null,
    perDraw,
    rowSeconds: seconds,
    meanRowSeconds: finished.length === 0 ? null : perDraw.filter((d) => d.state === 'finished').reduce((s, d) => s + d.seconds, 0) / finished.length,
    assumptions: CALIBRATION_ASSUMPTIONS,
  };
  writeJsonAtomic(join(out, 'calibration.json'), summary);
  const lines = ['draw,parameter,truth,rank,posteriorCdf,in68,in95', ...rows.map((r) => [r.draw, r.parameter, r.truth, r.rank, r.cdf, r.in68, r.in95].map(csvField).join(','))];
  writeFileAtomic(join(out, 'calibration-ranks.csv'), `${lines.join('\n')}\n`);
  return summary;
}
