import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { InputError, expectedFound } from '../errors.js';
import { summarisePerturbers, type PerturberSummary } from '../inference/perturberSummary.js';
import { runModelEvidence, type EvidenceSettings, type ModelEvidence } from '../inference/runModelEvidence.js';
import type { FlagCandidate } from './flagCandidate.js';
import { MapPositionPrior } from './mapPositionPrior.js';
import { firstPerturber, perturberPositionConfig, windowAround } from './perturberPositionConfig.js';
import type { ProbabilityMap } from './readProbabilityMap.js';
import { runMapPriorEvidence } from './runMapPriorEvidence.js';
import { defaultVetThresholds, vetVerdict, type VetThresholds, type VetVerdict } from './vetVerdict.js';

/** Settings of a vetting run. */
export interface VetSettings {
  /** Side of the square window of the perturber's position prior around each flag, arcsec (default 0.4). */
  readonly windowArcsec?: number;
  readonly thresholds?: VetThresholds;
  /**
   * Nested-sampling settings of one run, by its label: `smooth`, `candidate <id>` or `map prior`
   * (a function so that each run gets its own progress printer and checkpoint).
   */
  readonly evidence: (label: string, folderName: string) => EvidenceSettings;
  /** With a probability map: also one run with the map itself as the position prior. */
  readonly mapPrior?: { readonly map: ProbabilityMap };
  /** Called before each run starts. */
  readonly onRunStart?: (label: string) => void;
}

export const defaultVetWindowArcsec = 0.4;

/** One perturbed fit and its reading against the smooth model. */
export interface PerturbedVetting {
  readonly evidence: ModelEvidence;
  /** ln Z_perturbed - ln Z_smooth. */
  readonly lnBayesFactor: number;
  /** The two ln Z errors (Skilling's estimate) added in quadrature. */
  readonly lnBayesFactorError: number;
  readonly verdict: VetVerdict;
  readonly perturber: PerturberSummary;
  /** Folder name of this run under the output folder (e.g. `candidate-1`). */
  readonly folderName: string;
}

/** One flag vetted with a uniform position prior on the window around it. */
export interface CandidateVetting extends PerturbedVetting {
  readonly candidate: FlagCandidate;
  readonly window: { readonly xArcsec: readonly [number, number]; readonly yArcsec: readonly [number, number] };
  /** Distance of the posterior median position from the flag, arcsec. */
  readonly offsetArcsec: number;
  readonly config: ArcsiftConfig;
}

/** The whole vetting: one smooth fit shared by every candidate, one perturbed fit per candidate. */
export interface VetResult {
  readonly smooth: ModelEvidence;
  /** The settings of the smooth run (the others differ only in progress reporting and checkpoint). */
  readonly smoothSettings: EvidenceSettings;
  readonly candidates: readonly CandidateVetting[];
  /** The single fit with the map as the position prior, when asked for. */
  readonly mapPrior: (PerturbedVetting & { readonly mapFile: string; readonly config: ArcsiftConfig }) | undefined;
  readonly thresholds: VetThresholds;
  readonly windowArcsec: number;
}

function readPerturbed(evidence: ModelEvidence, smooth: ModelEvidence, thresholds: VetThresholds, folderName: string): PerturbedVetting {
  const lnBayesFactor = evidence.result.lnZ - smooth.result.lnZ;
  return {
    evidence,
    lnBayesFactor,
    lnBayesFactorError: Math.hypot(evidence.result.lnZError, smooth.result.lnZError),
    verdict: vetVerdict(lnBayesFactor, thresholds),
    perturber: summarisePerturbers(evidence)[0],
    folderName,
  };
}

/**
 * Vets network flags one after another: one nested-sampling run of the smooth model (the config
 * without perturbers), then for each candidate one run of the model with the config's first
 * perturber, its centre priors replaced by a uniform prior on the square window around the flag
 * (its mass prior as written). Each run uses every thread it is given; candidates run in turn
 * (candidate-level parallelism is left for later). With `mapPrior`, one more run takes the map
 * itself as the prior on the perturber's position (see MapPositionPrior).
 */
export async function vetFlags(
  config: ArcsiftConfig, data: ObservedData, candidates: readonly FlagCandidate[], settings: VetSettings,
): Promise<VetResult> {
  firstPerturber(config);
  const windowArcsec = settings.windowArcsec ?? defaultVetWindowArcsec;
  if (!(windowArcsec > 0) || !Number.isFinite(windowArcsec)) throw new InputError(`--window: ${expectedFound('a positive size in arcsec', windowArcsec)}`);
  const thresholds = settings.thresholds ?? defaultVetThresholds;
  if (!(thresholds.disfavourBelowLnB <= thresholds.confirmAboveLnB)) {
    throw new InputError(
      `verdict thresholds: expected --disfavour-below (${thresholds.disfavourBelowLnB}) <= --confirm-above (${thresholds.confirmAboveLnB})`,
    );
  }
  if (candidates.length === 0 && settings.mapPrior === undefined) throw new InputError('vetting: expected at least one candidate, found none');
  const mapPrior = settings.mapPrior === undefined ? undefined : new MapPositionPrior(settings.mapPrior.map, data.mask, data);

  settings.onRunStart?.('smooth');
  const smoothSettings = settings.evidence('smooth', 'smooth');
  const smooth = await runModelEvidence(config, data, 0, smoothSettings);
  const vetted: CandidateVetting[] = [];
  for (let k = 0; k < candidates.length; k++) {
    const candidate = candidates[k];
    const label = `candidate ${candidate.id}`;
    const folderName = `candidate-${k + 1}`;
    const window = windowAround(candidate.xArcsec, candidate.yArcsec, windowArcsec);
    const windowed = perturberPositionConfig(config, window.x, window.y);
    settings.onRunStart?.(label);
    const evidence = await runModelEvidence(windowed, data, 1, settings.evidence(label, folderName));
    const reading = readPerturbed(evidence, smooth, thresholds, folderName);
    const offsetArcsec = Math.hypot(
      reading.perturber.centerXArcsec.median - candidate.xArcsec, reading.perturber.centerYArcsec.median - candidate.yArcsec,
    );
    vetted.push({ ...reading, candidate, window: { xArcsec: window.x, yArcsec: window.y }, offsetArcsec, config: windowed });
  }
  let mapRun: VetResult['mapPrior'];
  if (mapPrior !== undefined && settings.mapPrior !== undefined) {
    settings.onRunStart?.('map prior');
    const evidence = await runMapPriorEvidence(config, data, mapPrior, settings.evidence('map prior', 'map-prior'));
    const { xMin, xMax, yMin, yMax } = mapPrior.bounds;
    mapRun = {
      ...readPerturbed(evidence, smooth, thresholds, 'map-prior'),
      mapFile: settings.mapPrior.map.file,
      config: perturberPositionConfig(config, [xMin, xMax], [yMin, yMax]),
    };
  }
  return { smooth, smoothSettings, candidates: vetted, mapPrior: mapRun, thresholds, windowArcsec };
}
