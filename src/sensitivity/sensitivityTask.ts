import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import type { DetectableMassSearch, MinimumDetectableMass } from './minimumDetectableMass.js';
import { PlantedPerturberStatistic, type SmoothBestFit } from './plantedPerturberStatistic.js';
import type { RefitSettings } from '../records/sensitivitySummary.js';

/** What a sensitivity worker needs to build its own statistic (plain data; the data's pixel arrays are shared). */
export interface SensitivityTask {
  readonly config: ArcsiftConfig;
  readonly data: ObservedData;
  readonly bestFit: SmoothBestFit;
  readonly refit: RefitSettings;
  /** Threshold on Delta chi^2 / 2 and the bisection tolerance; the mass range is the perturber's prior. */
  readonly threshold: number;
  readonly toleranceDex: number;
}

/** The search settings of a task over the statistic's mass prior range. */
export function searchOf(task: SensitivityTask, statistic: PlantedPerturberStatistic): DetectableMassSearch {
  const [lower, upper] = statistic.massPriorRange;
  return { lower, upper, threshold: task.threshold, toleranceDex: task.toleranceDex };
}

/** The message a worker is sent for one grid point. */
export interface SensitivityQuestion {
  readonly id: number;
  readonly xArcsec: number;
  readonly yArcsec: number;
}

/** The message a worker answers with for one grid point. */
export interface SensitivityAnswer {
  readonly id: number;
  readonly result: MinimumDetectableMass;
}
