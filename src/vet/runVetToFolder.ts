import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import type { ParameterSummary } from '../results/index.js';
import { bayesFactorReading } from '../results/index.js';
import { packageVersion } from '../records/packageVersion.js';
import { amplitudePriorText } from '../inference/amplitudePriorText.js';
import { configHash, priorCaution } from '../inference/runComparisonToFolder.js';
import { writeModelOutputs, type ModelRecord } from '../inference/writeModelOutputs.js';
import type { PriorDescription } from '../priors/parameterSpace.js';
import type { FlagSet } from './readFlags.js';
import { vetFlags, type PerturbedVetting, type VetResult, type VetSettings } from './vetFlags.js';
import type { VetThresholds, VetVerdict } from './vetVerdict.js';
import { formatVetCsv } from './formatVetCsv.js';

/** Said beside every evidence that took the network's map as its position prior. */
export const mapPriorNote =
  "The map-prior run takes the network's probability map (normalised over the mask) as the prior on the " +
  "perturber's position: its evidence, and so its Bayes factor, depends on the network, not on the pixels alone.";

/** What vet.json says of one perturbed run. */
export interface VetRunRecord {
  readonly id: string;
  /** Where the flag came from (file and line, or map pixel); the map file for the map-prior run. */
  readonly origin: string;
  readonly flag: { readonly xArcsec: number; readonly yArcsec: number } | null;
  readonly score: number | null;
  /** The position prior: the window around the flag, or the map. */
  readonly positionPrior: string;
  readonly lnBayesFactor: number;
  readonly lnBayesFactorError: number;
  readonly verdict: VetVerdict;
  /** Kass & Raftery 1995 reading of ln B. */
  readonly reading: string;
  /** log10 of the sampled mass (M200 for NFW-type perturbers, total mass otherwise), median and intervals. */
  readonly log10Mass: ParameterSummary;
  readonly log10MassUpperLimit95: number;
  readonly massPriorRange: readonly [number, number] | null;
  readonly position: { readonly xArcsec: ParameterSummary; readonly yArcsec: ParameterSummary };
  /** Distance of the posterior median position from the flag, arcsec (null for the map-prior run). */
  readonly offsetArcsec: number | null;
  readonly model: ModelRecord;
}

/** vet.json: written last, only for a finished vetting. */
export interface VetSummary {
  readonly arcsiftVersion: string;
  readonly kind: 'vet';
  readonly config: string;
  readonly configSha256: string;
  readonly data: ObservedData['files'];
  readonly dataNotices: readonly string[];
  readonly flags: {
    readonly file: string;
    readonly kind: 'list' | 'map';
    readonly mapThreshold: number | null;
    readonly mergeRadiusArcsec: number | null;
    readonly notices: readonly string[];
  };
  readonly seed: number;
  readonly settings: Record<string, unknown>;
  readonly runSeconds: number;
  readonly thresholds: VetThresholds;
  readonly windowArcsec: number;
  readonly perturberKind: string;
  readonly smooth: ModelRecord;
  readonly candidates: readonly VetRunRecord[];
  readonly mapPrior: VetRunRecord | null;
  readonly priors: {
    readonly smooth: readonly PriorDescription[];
    /** The perturbed models' priors without the perturber's centre, which `positionPrior` describes. */
    readonly perturbed: readonly PriorDescription[];
    readonly positionPrior: string;
  };
  readonly amplitudePrior: string;
  readonly caution: string;
  readonly mapPriorNote: string | null;
}

function runRecord(
  run: PerturbedVetting, model: ModelRecord, id: string, origin: string, positionPrior: string,
  flag: { xArcsec: number; yArcsec: number } | null, score: number | undefined, offsetArcsec: number | null,
): VetRunRecord {
  const p = run.perturber;
  return {
    id, origin, flag, score: score ?? null, positionPrior,
    lnBayesFactor: run.lnBayesFactor,
    lnBayesFactorError: run.lnBayesFactorError,
    verdict: run.verdict,
    reading: bayesFactorReading(run.lnBayesFactor).sentence,
    log10Mass: p.log10Mass,
    log10MassUpperLimit95: p.log10MassUpperLimit95,
    massPriorRange: p.massPriorRange,
    position: { xArcsec: p.centerXArcsec, yArcsec: p.centerYArcsec },
    offsetArcsec,
    model,
  };
}

const range = ([a, b]: readonly [number, number]): string => `[${+a.toFixed(4)}, ${+b.toFixed(4)}]`;

/**
 * Runs `vetFlags` and writes everything into `folder`: smooth/, candidate-1/, candidate-2/, ...
 * and map-prior/ (samples, corner data, best-fit images, checkpoints, as `compare` writes per
 * model), vet.csv (one row per run), and vet.json last, so it exists only for a finished run.
 */
export async function runVetToFolder(
  config: ArcsiftConfig, data: ObservedData, flags: FlagSet, folder: string, settings: VetSettings,
): Promise<{ result: VetResult; summary: VetSummary }> {
  const started = performance.now();
  const withCheckpoints: VetSettings = {
    ...settings,
    evidence: (label, folderName) => ({ ...settings.evidence(label, folderName), checkpointPath: join(folder, folderName, 'checkpoint.json') }),
  };
  const result = await vetFlags(config, data, flags.candidates, withCheckpoints);
  const { onProgress: _a, signal: _b, checkpointPath: _c, ...smoothSettings } = result.smoothSettings;
  const seed = smoothSettings.seed;
  const smooth = writeModelOutputs(result.smooth, config, data, join(folder, 'smooth'), seed);
  const candidates = result.candidates.map((c) => {
    const model = writeModelOutputs(c.evidence, c.config, data, join(folder, c.folderName), seed);
    return runRecord(
      c, model, c.candidate.id, c.candidate.origin,
      `x uniform on ${range(c.window.xArcsec)}, y uniform on ${range(c.window.yArcsec)} arcsec (a ${result.windowArcsec}" square around the flag)`,
      { xArcsec: c.candidate.xArcsec, yArcsec: c.candidate.yArcsec }, c.candidate.score, c.offsetArcsec,
    );
  });
  let mapPrior: VetRunRecord | null = null;
  if (result.mapPrior !== undefined) {
    const m = result.mapPrior;
    const model = writeModelOutputs(m.evidence, m.config, data, join(folder, m.folderName), seed);
    mapPrior = runRecord(m, model, 'map-prior', m.mapFile, `the probability map ${m.mapFile}, normalised over the mask`, null, undefined, null);
  }
  const perturbedRun = result.candidates[0]?.evidence ?? result.mapPrior?.evidence;
  const binding = perturbedRun?.system.perturbers[0];
  const centreNames = binding === undefined ? [] : [perturbedRun!.space.names[binding.centerXIndex], perturbedRun!.space.names[binding.centerYIndex]];
  const positionPrior = [
    result.candidates.length > 0 ? `uniform on a ${result.windowArcsec}" x ${result.windowArcsec}" square centred on each flag` : undefined,
    result.mapPrior !== undefined ? `the probability map ${result.mapPrior.mapFile} (map-prior run)` : undefined,
  ].filter((s) => s !== undefined).join('; ');
  const summary: VetSummary = {
    arcsiftVersion: packageVersion(),
    kind: 'vet',
    config: config.file,
    configSha256: configHash(config),
    data: data.files,
    dataNotices: data.notices,
    flags: {
      file: flags.file, kind: flags.kind,
      mapThreshold: flags.mapSettings?.threshold ?? null,
      mergeRadiusArcsec: flags.mapSettings?.mergeRadiusArcsec ?? null,
      notices: flags.notices,
    },
    seed,
    settings: smoothSettings,
    runSeconds: (performance.now() - started) / 1000,
    thresholds: result.thresholds,
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
