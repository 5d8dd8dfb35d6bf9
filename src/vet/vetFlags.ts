import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { InputError, expectedFound } from '../errors.js';
import { summarisePerturbers } from '../inference/perturberSummary.js';
import { awaitAllRuns } from '../inference/awaitAllRuns.js';
import { comparisonMethod, runModelEvidence, type EvidenceSettings, type ModelEvidence } from '../inference/runModelEvidence.js';
import type { FlagCandidate } from './flagCandidate.js';
import { MapPositionPrior } from './mapPositionPrior.js';
import { firstPerturber, perturberPositionConfig, windowAround } from './perturberPositionConfig.js';
import type { ProbabilityMap } from './readProbabilityMap.js';
import { runMapPriorEvidence } from './runMapPriorEvidence.js';
import { defaultVetThresholds, vetVerdict } from './vetVerdict.js';
import type { PerturberSummary } from '../records/perturberSummary.js';
import type { VetThresholds, VetVerdict } from '../records/vetSummary.js';
import { runDefaults } from '../settings/runDefaults.js';

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
  /** Called as each run starts (runs may overlap: see vetConcurrency). */
  readonly onRunStart?: (label: string) => void;
}


/** One perturbed fit and its reading against the smooth model. */
export interface PerturbedVetting {
  readonly evidence: ModelEvidence;
  /** ln Z_perturbed - ln Z_smooth. */
  readonly lnBayesFactor: number;
  /** The two ln Z errors (Skilling's estimate) added in quadrature. */
  readonly lnBayesFactorError: number;
  /** The verdict of ln B alone; runVetToFolder turns it into `not-evidence` when the smooth fit fails the misfit alarm. */
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

function readPerturbed(
  evidence: ModelEvidence, smooth: ModelEvidence, thresholds: VetThresholds, folderName: string, sky: ImagePlaneSky | undefined,
): PerturbedVetting {
  const lnBayesFactor = evidence.result.lnZ - smooth.result.lnZ;
  return {
    evidence,
    lnBayesFactor,
    lnBayesFactorError: Math.hypot(evidence.result.lnZError, smooth.result.lnZError),
    verdict: vetVerdict(lnBayesFactor, thresholds),
    perturber: summarisePerturbers(evidence, sky)[0],
    folderName,
  };
}

/**
 * How many runs of a vetting go side by side on `threads` threads: one per thread, at most one
 * per run. Each then gets floor(threads / concurrency) threads of its own.
 */
export function vetConcurrency(threads: number, runs: number): number {
  return Math.max(1, Math.min(Math.floor(threads), runs));
}

/**
 * Runs `jobs` with at most `concurrency` at once, in list order; results in list order. After a
 * failure no job starts, and the running ones end (each writes its checkpoint) before the first
 * failure is thrown (awaitAllRuns).
 */
async function runSideBySide<T>(jobs: readonly (() => Promise<T>)[], concurrency: number): Promise<T[]> {
  const results = new Array<T>(jobs.length);
  let next = 0;
  let failed = false;
  const lane = async (): Promise<void> => {
    while (next < jobs.length && !failed) {
      const k = next++;
      try {
        results[k] = await jobs[k]();
      } catch (error) {
        failed = true;
        throw error;
      }
    }
  };
  await awaitAllRuns(Array.from({ length: concurrency }, lane));
  return results;
}

/**
 * Vets network flags: one nested-sampling run of the smooth model (the config without
 * perturbers), and for each candidate one run of the model with the config's first perturber, its
 * centre priors replaced by a uniform prior on the square window around the flag (its mass prior
 * as written). The runs do not depend on each other, so they go side by side, one per thread
 * (vetConcurrency), each in a worker of its own; with fewer runs than threads each run gets
 * several. A run's result depends only on its own seed, never on the thread count. With
 * `mapPrior`, one more run takes the map itself as the prior on the perturber's position (see
 * MapPositionPrior).
 */
export async function vetFlags(
  config: ArcsiftConfig, data: ObservedData, candidates: readonly FlagCandidate[], settings: VetSettings,
): Promise<VetResult> {
  firstPerturber(config);
  const windowArcsec = settings.windowArcsec ?? runDefaults.vet.windowArcsec;
  if (!(windowArcsec > 0) || !Number.isFinite(windowArcsec)) throw new InputError(`--window: ${expectedFound('a positive size in arcsec', windowArcsec)}`);
  const thresholds = settings.thresholds ?? defaultVetThresholds();
  if (!(thresholds.disfavourBelowLnB <= thresholds.confirmAboveLnB)) {
    throw new InputError(
      `verdict thresholds: expected --disfavour-below (${thresholds.disfavourBelowLnB}) <= --detection-threshold (${thresholds.confirmAboveLnB})`,
    );
  }
  if (candidates.length === 0 && settings.mapPrior === undefined) throw new InputError('vetting: expected at least one candidate, found none');
  const mapPrior = settings.mapPrior === undefined ? undefined : new MapPositionPrior(settings.mapPrior.map, data.mask, data);

  const smoothSettings = settings.evidence('smooth', 'smooth');
  const runs = 1 + candidates.length + (mapPrior === undefined ? 0 : 1);
  const concurrency = vetConcurrency(smoothSettings.threads, runs);
  const method = comparisonMethod(config, 1, smoothSettings);
  const share = (run: EvidenceSettings): EvidenceSettings => (concurrency === 1
    ? { ...run, method }
    : { ...run, method, threads: Math.max(1, Math.floor(run.threads / concurrency)), inWorker: true });

  const windows = candidates.map((c) => windowAround(c.xArcsec, c.yArcsec, windowArcsec));
  const windowedConfigs = windows.map((w) => perturberPositionConfig(config, w.x, w.y));
  const jobs: (() => Promise<ModelEvidence>)[] = [
    async () => {
      settings.onRunStart?.('smooth');
      return runModelEvidence(config, data, 0, share(smoothSettings));
    },
    ...candidates.map((candidate, k) => async () => {
      const label = `candidate ${candidate.id}`;
      settings.onRunStart?.(label);
      return runModelEvidence(windowedConfigs[k], data, 1, share(settings.evidence(label, `candidate-${k + 1}`)));
    }),
  ];
  if (mapPrior !== undefined) {
    jobs.push(async () => {
      settings.onRunStart?.('map prior');
      return runMapPriorEvidence(config, data, mapPrior, share(settings.evidence('map prior', 'map-prior')));
    });
  }
  const evidences = await runSideBySide(jobs, concurrency);
  const smooth = evidences[0];
  const sky = ImagePlaneSky.of(data);

  const vetted: CandidateVetting[] = candidates.map((candidate, k) => {
    const folderName = `candidate-${k + 1}`;
    const reading = readPerturbed(evidences[1 + k], smooth, thresholds, folderName, sky);
    const offsetArcsec = Math.hypot(
      reading.perturber.centerXArcsec.median - candidate.xArcsec, reading.perturber.centerYArcsec.median - candidate.yArcsec,
    );
    return { ...reading, candidate, window: { xArcsec: windows[k].x, yArcsec: windows[k].y }, offsetArcsec, config: windowedConfigs[k] };
  });
  let mapRun: VetResult['mapPrior'];
  if (mapPrior !== undefined && settings.mapPrior !== undefined) {
    const { xMin, xMax, yMin, yMax } = mapPrior.bounds;
    mapRun = {
      ...readPerturbed(evidences[1 + candidates.length], smooth, thresholds, 'map-prior', sky),
      mapFile: settings.mapPrior.map.file,
      config: perturberPositionConfig(config, [xMin, xMax], [yMin, yMax]),
    };
  }
  return { smooth, smoothSettings, candidates: vetted, mapPrior: mapRun, thresholds, windowArcsec };
}
