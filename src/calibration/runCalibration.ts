import { existsSync, mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { loadConfig } from '../config/arcsiftConfig.js';
import { InputError } from '../errors.js';
import { csvField } from '../io/csvField.js';
import { writeFileAtomic } from '../io/writeFileAtomic.js';
import { configHash } from '../records/configHash.js';
import type { CalibrationSummary } from '../records/calibrationSummary.js';
import { runDefaults } from '../settings/runDefaults.js';
import { runBatch, type BatchOutcome, type BatchSettings } from '../batch/runBatch.js';
import { drawDataFolder, planCalibrationDraws, readCalibrationDraws, simulateCalibrationDraws, type CalibrationDrawsRecord } from './calibrationDraws.js';
import { collectCalibration } from './collectCalibration.js';

export interface CalibrationSettings {
  readonly config: string;
  readonly out: string;
  /** Draws with the config's perturbers, from their priors. */
  readonly draws: number;
  /** Draws without perturbers (the smooth model's prior). */
  readonly nullDraws: number;
  /** compare (both models on every draw: ranks, coverage and detections) or fit (the true model only). */
  readonly job: 'fit' | 'compare';
  readonly seed?: number;
  /** Options of every fit, e.g. ['--live-points', '50']. */
  readonly runOptions?: readonly string[];
  readonly rankDraws?: number;
  readonly detectAboveLnB?: number;
  /** Only collect what has finished; run nothing. */
  readonly collectOnly?: boolean;
  /** How the fits run: here or on Slurm (see runBatch). */
  readonly batch?: Omit<BatchSettings, 'manifest' | 'out' | 'runOptions' | 'reports'>;
  readonly onNote?: (line: string) => void;
}

export interface CalibrationOutcome {
  readonly batch: BatchOutcome | null;
  /** Null when the fits went to Slurm and have not all ended: collect later. */
  readonly summary: CalibrationSummary | null;
  readonly out: string;
}

/** The batch manifest of a calibration: one row per draw, its job on the draw's data with the config's priors. */
function writeCalibrationManifest(out: string, configPath: string, record: CalibrationDrawsRecord, job: 'fit' | 'compare'): string {
  const file = join(out, 'manifest.csv');
  const lines = ['id,job,config,data,options', ...record.draws.map((d) => [
    d.id, job, configPath, resolve(drawDataFolder(out, d.id)), job === 'fit' && !d.withPerturber ? '--perturbers 0' : '',
  ].map(csvField).join(','))];
  writeFileAtomic(file, `${lines.join('\n')}\n`);
  return file;
}

/**
 * Simulation-based calibration of a config's inference: draws parameter sets from the config's
 * priors (`draws` with its perturbers, `nullDraws` without), simulates each with `simulate`'s
 * noise model, fits each through the batch machinery (here or on Slurm; resumable like any
 * batch) and collects rank statistics, interval coverage and, for comparisons, the detection
 * rates into calibration.json. Calling it again continues: existing simulations and finished
 * fits are kept; more draws may be added with the same seed.
 */
export async function runCalibration(settings: CalibrationSettings): Promise<CalibrationOutcome> {
  const out = resolve(settings.out);
  const configPath = resolve(settings.config);
  const config = loadConfig(configPath);
  const seed = settings.seed ?? runDefaults.calibration.seed;
  if (settings.draws < 0 || settings.nullDraws < 0 || settings.draws + settings.nullDraws === 0) throw new InputError('a calibration needs at least one draw (--draws or --null-draws)');
  if (settings.draws > 0 && config.perturbers.length === 0) throw new InputError('--draws with a perturber needs a config with perturbers; give --null-draws only', { file: configPath });
  if (settings.job === 'compare' && config.perturbers.length === 0) throw new InputError('a compare calibration needs a config with a perturber (the perturbed model)', { file: configPath });
  mkdirSync(out, { recursive: true });
  const drawsFile = join(out, 'draws.json');
  const sha = configHash(config);
  if (existsSync(drawsFile)) {
    const earlier = readCalibrationDraws(drawsFile);
    if (earlier.configSha256 !== sha || earlier.seed !== seed || earlier.config !== configPath) {
      throw new InputError(`this calibration was drawn from ${earlier.config} (sha256 ${earlier.configSha256.slice(0, 12)}) with seed ${earlier.seed}; give the same config and seed to continue it, or choose another --out`, { file: drawsFile });
    }
  }
  const record: CalibrationDrawsRecord = {
    format: 'arcsift calibration draws', config: configPath, configSha256: sha, seed,
    draws: planCalibrationDraws(config, settings.draws, settings.nullDraws, seed),
  };
  const made = simulateCalibrationDraws(config, record, out);
  if (made > 0) settings.onNote?.(`simulated ${made} draw(s) into ${join(out, 'draws')}`);
  const manifest = writeCalibrationManifest(out, configPath, record, settings.job);
  const runOptions = settings.runOptions ?? [];
  let batch: BatchOutcome | null = null;
  if (settings.collectOnly !== true) {
    batch = await runBatch({ ...settings.batch, manifest, out: join(out, 'batch'), runOptions, reports: false, onNote: settings.batch?.onNote ?? settings.onNote });
    if (batch.mode === 'slurm' && batch.submissions.length > 0) return { batch, summary: null, out };
  }
  const summary = collectCalibration({
    out, config, draws: record, job: settings.job, runOptions,
    rankDraws: settings.rankDraws ?? runDefaults.calibration.rankDraws,
    detectAboveLnB: settings.detectAboveLnB ?? runDefaults.calibration.detectAboveLnB,
    maxAttempts: settings.batch?.maxAttempts,
  });
  return { batch, summary, out };
}
