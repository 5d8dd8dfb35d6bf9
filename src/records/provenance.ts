import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { CutoutBox } from '../data/cutoutBox.js';
import type { ObservedData, ObservedDataFiles } from '../data/observedData.js';
import type { CelestialWcsDescription } from '../fits/celestialWcs.js';
import { configHash } from './configHash.js';
import { configuredCosmology, type CosmologyRecord } from '../cosmology/configuredCosmology.js';
import { packageVersion } from '../io/packageVersion.js';

/**
 * What every run record starts with: whether the run finished, which arcsift made it, from which
 * config, data and seed, in how long.
 */
export interface RunProvenance {
  /**
   * False when a limit (--max-evaluations, --max-sweeps) cut a sampler short: its ln Z, Bayes
   * factors and intervals are not final (the command then exits with status 3).
   */
  readonly finished: boolean;
  /** The sampler runs cut short, as `label (why)`; empty for a finished run. */
  readonly unfinishedRuns: readonly string[];
  readonly arcsiftVersion: string;
  readonly config: string;
  readonly configSha256: string;
  readonly data: ObservedDataFiles;
  /** sha256 of each data file's bytes, keyed as `data`. */
  readonly dataSha256: Readonly<Partial<Record<keyof ObservedDataFiles, string>>>;
  /** What was assumed or changed while loading the data. */
  readonly dataNotices: readonly string[];
  readonly seed: number;
  /** The cosmology behind every distance, critical density and M200 of the run. */
  readonly cosmology: CosmologyRecord;
  readonly runSeconds: number;
  /** The celestial WCS of the fitted pixels (after any cut-out), when the image has one. */
  readonly wcs?: CelestialWcsDescription;
  /** The part of the image file's frame that was fitted, when a cut-out was asked for. */
  readonly cutout?: CutoutBox;
  /** How the image became counts per second (BUNIT, EXPTIME). */
  readonly imageUnit?: string;
}

/** The provenance of a run started at `startedMs` (performance.now()) and ending now; `unfinished` lists the sampler runs cut short. */
export function runProvenance(
  config: ArcsiftConfig, data: ObservedData, seed: number, startedMs: number, unfinished: readonly string[],
): RunProvenance {
  return {
    finished: unfinished.length === 0,
    unfinishedRuns: unfinished,
    arcsiftVersion: packageVersion(),
    config: config.file,
    configSha256: configHash(config),
    data: data.files,
    dataSha256: data.fileSha256 ?? {},
    dataNotices: data.notices,
    seed,
    cosmology: configuredCosmology(config).record,
    runSeconds: (performance.now() - startedMs) / 1000,
    ...(data.wcs === undefined ? {} : { wcs: data.wcs }),
    ...(data.cutout === undefined ? {} : { cutout: data.cutout }),
    ...(data.imageUnit === undefined ? {} : { imageUnit: data.imageUnit }),
  };
}
