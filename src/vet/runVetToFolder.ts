import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { runDefaults } from '../settings/runDefaults.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import type { ParameterSummary } from '../results/index.js';
import { bayesFactorReading, thresholdSource } from '../results/index.js';
import { amplitudePriorText } from '../inference/amplitudePriorText.js';
import { writeModelOutputs } from '../inference/writeModelOutputs.js';
import type { PriorDescription } from '../priors/parameterSpace.js';
import type { FlagSet } from './readFlags.js';
import { vetFlags, type PerturbedVetting, type VetResult, type VetSettings } from './vetFlags.js';
import { formatVetCsv } from './formatVetCsv.js';
import { mapPriorNote, priorCaution } from '../records/cautions.js';
import type { ModelRecord } from '../records/modelRecord.js';
import type { VetRunRecord, VetSummary, VetThresholds, VetVerdict } from '../records/vetSummary.js';
import { runProvenance } from '../records/provenance.js';
import { defaultVetThresholds, vetVerdict } from './vetVerdict.js';
import type { MisfitRecord } from '../records/misfitRecord.js';
import { qualifiedReading, unfinishedRuns } from '../records/unfinishedRuns.js';

/** Why a vetting's Bayes factors are not evidence when its shared smooth fit fails the misfit alarm. */
function smoothMisfitNote(misfit: MisfitRecord): string {
  return `The shared smooth fit fails the misfit alarm (Moran's I of its normalised residuals ${misfit.moransI.toFixed(4)}, ` +
    `permutation p = ${misfit.pValue.toPrecision(2)} <= ${misfit.falseAlarmRate}): its residuals hold structure the smooth model missed, ` +
    'so no ln B here is evidence of a subhalo (a perturber at a flag may stand in for what the smooth model lacks); every ' +
    'candidate is "not-evidence". Compare smooth families with more freedom with `arcsift verdict`.';
}

/** A flag's position for vet.json: x, y, and RA, Dec when the image has a celestial WCS. */
function flagRecord(xArcsec: number, yArcsec: number, sky: ImagePlaneSky | undefined): NonNullable<VetRunRecord['flag']> {
  if (sky === undefined) return { xArcsec, yArcsec };
  const { raDeg, decDeg } = sky.skyOf(xArcsec, yArcsec);
  return { xArcsec, yArcsec, raDeg, decDeg };
}

function runRecord(
  run: PerturbedVetting, model: ModelRecord, smooth: ModelRecord, id: string, origin: string, positionPrior: string,
  flag: VetRunRecord['flag'], score: number | undefined, offsetArcsec: number | null, thresholds: VetThresholds,
): VetRunRecord {
  const p = run.perturber;
  const unfinished = unfinishedRuns([{ label: 'smooth', stopReason: smooth.stopReason }, { label: id, stopReason: model.stopReason }]);
  return {
    id, origin, flag, score: score ?? null, positionPrior,
    lnBayesFactor: run.lnBayesFactor,
    lnBayesFactorError: run.lnBayesFactorError,
    verdict: vetVerdict(run.lnBayesFactor, thresholds, smooth.misfit.alarm),
    reading: qualifiedReading(bayesFactorReading(run.lnBayesFactor).sentence, unfinished),
    finished: unfinished.length === 0,
    log10Mass: p.log10Mass,
    log10MassUpperLimit95: p.log10MassUpperLimit95,
    massPriorRange: p.massPriorRange,
    position: { xArcsec: p.centerXArcsec, yArcsec: p.centerYArcsec, ...(p.sky === undefined ? {} : { sky: p.sky }) },
    offsetArcsec,
    model,
  };
}

const range = ([a, b]: readonly [number, number]): string => `[${+a.toFixed(4)}, ${+b.toFixed(4)}]`;

/** What vet.json says of the flags file. */
function flagsRecord(flags: FlagSet): VetSummary['flags'] {
  return {
    file: flags.file, kind: flags.kind,
    mapThreshold: flags.mapSettings?.threshold ?? null,
    mergeRadiusArcsec: flags.mapSettings?.mergeRadiusArcsec ?? null,
    notices: flags.notices,
  };
}

/**
 * vet.csv (a header, no rows) and vet.json for flags with no candidate (a map with no value at
 * the threshold): a valid answer for a survey, written without running any fit.
 */
function writeNothingToVet(config: ArcsiftConfig, data: ObservedData, flags: FlagSet, folder: string, settings: VetSettings, started: number): VetSummary {
  const { onProgress: _a, signal: _b, checkpointPath: _c, ...smoothSettings } = settings.evidence('smooth', 'smooth');
  const summary: VetSummary = {
    kind: 'vet',
    ...runProvenance(config, data, smoothSettings.seed, started, []),
    flags: flagsRecord(flags),
    settings: smoothSettings,
    thresholds: settings.thresholds ?? defaultVetThresholds(),
    thresholdSource: thresholdSource((settings.thresholds ?? defaultVetThresholds()).confirmAboveLnB),
    smoothMisfitNote: null,
    windowArcsec: settings.windowArcsec ?? runDefaults.vet.windowArcsec,
    perturberKind: config.perturbers[0]?.kind ?? '',
    smooth: null,
    candidates: [],
    mapPrior: null,
    priors: { smooth: [], perturbed: [], positionPrior: 'no candidates: no fit was run' },
    amplitudePrior: amplitudePriorText(config),
    caution: priorCaution,
    mapPriorNote: null,
  };
  writeFileAtomic(join(folder, 'vet.csv'), formatVetCsv(summary));
  writeJsonAtomic(join(folder, 'vet.json'), summary);
  return summary;
}

/**
 * Runs `vetFlags` and writes everything into `folder`: smooth/, candidate-1/, candidate-2/, ...
 * and map-prior/ (samples, corner data, best-fit images, checkpoints, as `compare` writes per
 * model), vet.csv (one row per run), and vet.json last, so it exists only for a finished run.
 */
export async function runVetToFolder(
  config: ArcsiftConfig, data: ObservedData, flags: FlagSet, folder: string, settings: VetSettings,
): Promise<{ result: VetResult | undefined; summary: VetSummary }> {
  const started = performance.now();
  const sky = ImagePlaneSky.of(data);
  if (flags.candidates.length === 0 && settings.mapPrior === undefined) return { result: undefined, summary: writeNothingToVet(config, data, flags, folder, settings, started) };
  const withCheckpoints: VetSettings = {
    ...settings,
    evidence: (label, folderName) => ({ ...settings.evidence(label, folderName), checkpointPath: join(folder, folderName, 'checkpoint.json') }),
  };
  const result = await vetFlags(config, data, flags.candidates, withCheckpoints);
  const { onProgress: _a, signal: _b, checkpointPath: _c, ...smoothSettings } = result.smoothSettings;
  const seed = smoothSettings.seed;
  const smooth = writeModelOutputs(result.smooth, config, data, join(folder, 'smooth'), seed);
  const smoothMisfit = smooth.misfit.alarm;
  const candidates = result.candidates.map((c) => {
    const model = writeModelOutputs(c.evidence, c.config, data, join(folder, c.folderName), seed);
    return runRecord(
      c, model, smooth, c.candidate.id, c.candidate.origin,
      `x uniform on ${range(c.window.xArcsec)}, y uniform on ${range(c.window.yArcsec)} arcsec (a ${result.windowArcsec}" square around the flag)`,
      flagRecord(c.candidate.xArcsec, c.candidate.yArcsec, sky), c.candidate.score, c.offsetArcsec, result.thresholds,
    );
  });
  let mapPrior: VetRunRecord | null = null;
  if (result.mapPrior !== undefined) {
    const m = result.mapPrior;
    const model = writeModelOutputs(m.evidence, m.config, data, join(folder, m.folderName), seed);
    mapPrior = runRecord(
      m, model, smooth, 'map-prior', m.mapFile, `the probability map ${m.mapFile}, normalised over the mask`, null, undefined, null, result.thresholds,
    );
  }
  const perturbedRun = result.candidates[0]?.evidence ?? result.mapPrior?.evidence;
  const binding = perturbedRun?.system.perturbers[0];
  const centreNames = binding === undefined ? [] : [perturbedRun!.space.names[binding.centerXIndex], perturbedRun!.space.names[binding.centerYIndex]];
  const positionPrior = [
    result.candidates.length > 0 ? `uniform on a ${result.windowArcsec}" x ${result.windowArcsec}" square centred on each flag` : undefined,
    result.mapPrior !== undefined ? `the probability map ${result.mapPrior.mapFile} (map-prior run)` : undefined,
  ].filter((s) => s !== undefined).join('; ');
  const unfinished = unfinishedRuns([
    { label: 'smooth', stopReason: smooth.stopReason },
    ...[...candidates, ...(mapPrior === null ? [] : [mapPrior])].map((r) => ({ label: r.id, stopReason: r.model.stopReason })),
  ]);
  const summary: VetSummary = {
    kind: 'vet',
    ...runProvenance(config, data, seed, started, unfinished),
    flags: flagsRecord(flags),
    settings: smoothSettings,
    thresholds: result.thresholds,
    thresholdSource: thresholdSource(result.thresholds.confirmAboveLnB),
    smoothMisfitNote: smoothMisfit ? smoothMisfitNote(smooth.misfit) : null,
    windowArcsec: result.windowArcsec,
    perturberKind: binding?.kind ?? config.perturbers[0].kind,
    smooth,
    candidates,
    mapPrior,
    priors: {
      smooth: result.smooth.space.describe(),
      perturbed: perturbedRun === undefined ? [] : perturbedRun.space.describe().filter((p) => !centreNames.includes(p.name)),
      positionPrior: `${centreNames.join(', ')}: ${positionPrior}`,
    },
    amplitudePrior: amplitudePriorText(config),
    caution: priorCaution,
    mapPriorNote: result.mapPrior === undefined ? null : mapPriorNote,
  };
  writeFileAtomic(join(folder, 'vet.csv'), formatVetCsv(summary));
  writeJsonAtomic(join(folder, 'vet.json'), summary);
  return { result, summary };
}
