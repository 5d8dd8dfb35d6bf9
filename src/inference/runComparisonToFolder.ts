import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { compareModels, type Comparison, type ComparisonSettings } from './compareModels.js';
import { writeComparisonFolder } from './writeComparisonFolder.js';
import type { ComparisonSummary } from '../records/comparisonSummary.js';

/** The settings with each model's checkpoint in its folder under `folder` (smooth/, perturbed/). */
export function withComparisonCheckpoints(folder: string, settings: ComparisonSettings): ComparisonSettings {
  return {
    ...settings,
    smooth: { ...settings.smooth, checkpointPath: join(folder, 'smooth', 'checkpoint.json') },
    perturbed: { ...settings.perturbed, checkpointPath: join(folder, 'perturbed', 'checkpoint.json') },
  };
}

/**
 * Runs `compareModels` and writes everything into `folder`: smooth/ and perturbed/ (samples,
 * corner data, best-fit images, checkpoints) and summary.json last, so a summary exists only for
 * a finished run (writeComparisonFolder).
 */
export async function runComparisonToFolder(
  config: ArcsiftConfig, data: ObservedData, folder: string, settings: ComparisonSettings,
): Promise<{ comparison: Comparison; summary: ComparisonSummary }> {
  const started = performance.now();
  const comparison = await compareModels(config, data, withComparisonCheckpoints(folder, settings));
  return { comparison, summary: writeComparisonFolder(comparison, config, data, folder, settings, started) };
}
