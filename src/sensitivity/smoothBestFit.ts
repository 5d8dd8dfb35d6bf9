import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { InputError } from '../errors.js';
import { runModelEvidence, type EvidenceSettings } from '../inference/runModelEvidence.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { buildLensSystem } from '../model/lensSystem.js';
import { modelVectorFromRecord } from '../model/modelVectorFromRecord.js';
import type { SmoothBestFit } from './plantedPerturberStatistic.js';

/** A smooth best fit and where it came from. */
export interface SmoothBestFitSource extends SmoothBestFit {
  /** `run folder DIR` or `nested run (N live points)`. */
  readonly from: string;
  readonly bestLnLikelihood: number;
  /** Why the run that found it stopped: 'converged', or the limit that cut it short. */
  readonly stopReason: string;
}

function withAmplitudes(
  config: ArcsiftConfig, data: ObservedData, parameters: Float64Array, from: string, stopReason: string,
): SmoothBestFitSource {
  const fit = new PixelLikelihood(config, data, 0).modelImage(parameters);
  return { parameters, amplitudes: fit.amplitudes, from, bestLnLikelihood: fit.logLikelihood, stopReason };
}

/**
 * The smooth model's best-fit parameters from a finished run folder: its summary.json (written by
 * `compare`, `fit` of a smooth model, or `vet`) must hold a smooth model record with `bestFit`.
 * Every parameter of the config's smooth model is looked up by name; the amplitudes are
 * recomputed on `data` (posterior mean given the parameters).
 */
export function smoothBestFitFromFolder(config: ArcsiftConfig, data: ObservedData, folder: string): SmoothBestFitSource {
  const candidates = [join(folder, 'summary.json'), join(folder, 'vet.json')];
  const path = candidates.find((p) => existsSync(p));
  if (path === undefined) throw new InputError('best-fit run folder: expected a finished run holding summary.json (or vet.json), found none', { file: folder });
  let summary: Record<string, unknown>;
  try {
    summary = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
  } catch (error) {
    throw new InputError(`cannot read the run summary: ${(error as Error).message}`, { file: path });
  }
  const models = summary.models as Record<string, unknown> | unknown[] | undefined;
  const records = [
    Array.isArray(models) ? undefined : models?.smooth, summary.model, summary.smooth, ...(Array.isArray(models) ? models : []),
  ] as ({ label?: unknown; bestFit?: unknown } | undefined)[];
  const record = records.find((r) => r !== undefined && r !== null && r.label === 'smooth' && typeof r.bestFit === 'object' && r.bestFit !== null) as
    ({ bestFit: unknown; stopReason?: unknown } | undefined);
  if (record === undefined) {
    throw new InputError('best-fit run folder: expected a smooth model record with bestFit (from compare, a smooth fit, or vet), found none', { file: path });
  }
  const bestFit = record.bestFit as Record<string, unknown>;
  const system = buildLensSystem(config, { perturberCount: 0 });
  const parameters = modelVectorFromRecord(system, bestFit, path, 'bestFit');
  return withAmplitudes(config, data, parameters, `run folder ${folder}`, typeof record.stopReason === 'string' ? record.stopReason : 'converged');
}

/** The smooth model's highest-likelihood point of a (short) nested-sampling run. */
export async function smoothBestFitFromRun(config: ArcsiftConfig, data: ObservedData, settings: EvidenceSettings): Promise<SmoothBestFitSource> {
  const run = await runModelEvidence(config, data, 0, settings);
  const { result, space } = run;
  let best = 0;
  for (let r = 1; r < result.count; r++) if (result.lnL[r] > result.lnL[best]) best = r;
  const parameters = result.points.slice(best * space.physicalDim, (best + 1) * space.physicalDim);
  return withAmplitudes(config, data, parameters, `nested run of the smooth model (${settings.livePoints} live points, seed ${settings.seed})`, result.stopReason);
}
