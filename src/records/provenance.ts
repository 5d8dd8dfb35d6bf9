import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData, ObservedDataFiles } from '../data/observedData.js';
import { configHash } from './configHash.js';
import { packageVersion } from '../io/packageVersion.js';

/** What every run record starts with: which arcsift made it, from which config, data and seed, in how long. */
export interface RunProvenance {
  readonly arcsiftVersion: string;
  readonly config: string;
  readonly configSha256: string;
  readonly data: ObservedDataFiles;
  /** What was assumed or changed while loading the data. */
  readonly dataNotices: readonly string[];
  readonly seed: number;
  readonly runSeconds: number;
}

/** The provenance of a run started at `startedMs` (performance.now()) and ending now. */
export function runProvenance(config: ArcsiftConfig, data: ObservedData, seed: number, startedMs: number): RunProvenance {
  return {
    arcsiftVersion: packageVersion(),
    config: config.file,
    configSha256: configHash(config),
    data: data.files,
    dataNotices: data.notices,
    seed,
    runSeconds: (performance.now() - startedMs) / 1000,
  };
}
