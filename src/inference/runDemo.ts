import { rmSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig, type ArcsiftConfig } from '../config/arcsiftConfig.js';
import { loadObservedData } from '../data/loadObservedData.js';
import { buildLensSystem } from '../model/lensSystem.js';
import type { ComparisonSummary } from '../records/comparisonSummary.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { checkOutputFolder } from './checkOutputFolder.js';
import type { Comparison } from './compareModels.js';
import { runComparisonToFolder } from './runComparisonToFolder.js';
import type { EvidenceSettings } from './runModelEvidence.js';
import { placeTruth, type TruthPlacement } from './truthComparison.js';

/** configs/demo.yaml of the installed package: the built-in scenario. */
export const demoConfigPath = fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url));

export interface DemoSettings {
  /** The scenario (default demoConfigPath); its values are the truth simulated. */
  readonly configPath?: string;
  /** Folder of the run: data/ (the simulation) and compare/ (the comparison) inside. */
  readonly out: string;
  readonly noiseSeed: number;
  /** Remove an earlier comparison in `out` first (ignored when resuming). */
  readonly fresh: boolean;
  readonly smooth: EvidenceSettings;
  readonly perturbed: EvidenceSettings;
  /** Called when the simulation is written, and when each model's run starts. */
  readonly onStage?: (stage: 'simulated' | 'smooth' | 'perturbed') => void;
}

export interface DemoOutcome {
  readonly config: ArcsiftConfig;
  readonly dataFolder: string;
  readonly compareFolder: string;
  readonly comparison: Comparison;
  readonly summary: ComparisonSummary;
  /** Where the planted perturber's true mass and position fall in the perturbed posterior. */
  readonly truth: readonly TruthPlacement[];
}

/**
 * The main job on a scenario with a known truth: simulate the config's values (noise seeded by
 * `noiseSeed`), compare the smooth and the perturbed model on the simulation, and place the
 * planted perturber's true mass and position in the posterior (what `arcsift demo` prints).
 */
export async function runDemo(settings: DemoSettings): Promise<DemoOutcome> {
  const config = loadConfig(settings.configPath ?? demoConfigPath);
  const dataFolder = join(settings.out, 'data');
  const compareFolder = join(settings.out, 'compare');
  if (settings.fresh && settings.smooth.resume !== true) rmSync(compareFolder, { recursive: true, force: true });
  checkOutputFolder(compareFolder, settings.smooth.resume === true, ['smooth', 'perturbed']);
  // The demo owns its data folder: simulated again each time (the same bytes for the same seed).
  simulateToFolder(config, dataFolder, { seed: settings.noiseSeed, noiseless: false, overwrite: true });
  settings.onStage?.('simulated');
  const { columns, rows, pixelScaleArcsec } = config.observation;
  const data = loadObservedData({ folder: dataFolder }, { columns, rows, pixelScaleArcsec });
  const { comparison, summary } = await runComparisonToFolder(config, data, compareFolder, {
    smooth: settings.smooth,
    perturbed: settings.perturbed,
    perturberCount: 1,
    onModelStart: (label) => settings.onStage?.(label === 'perturbed' ? 'perturbed' : 'smooth'),
  });
  const values = buildLensSystem(config).configuredValues();
  const entries = config.perturbers[0].entries;
  const truth = placeTruth(comparison, values, [entries.log10MassSolar.key, entries.centerXArcsec.key, entries.centerYArcsec.key]);
  return { config, dataFolder, compareFolder, comparison, summary, truth };
}
