import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { InputError } from '../errors.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import { buildLensSystem } from '../model/lensSystem.js';
import { modelParameterSpace } from '../model/modelParameterSpace.js';
import { modelPriorTransform } from '../model/modelPriorTransform.js';
import { derivedSeed } from '../numeric/random/derivedSeed.js';
import { SeededStream } from '../numeric/random/seededStream.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { configWithValues } from './configWithValues.js';
import { observationAsData } from './observationAsData.js';

/** One simulated data set of a calibration: its parameters drawn from the prior, its noise seed. */
export interface CalibrationDraw {
  /** `draw-0001` (with the config's perturbers) or `null-0001` (without). */
  readonly id: string;
  readonly withPerturber: boolean;
  /** Seed of the simulation's noise. */
  readonly noiseSeed: number;
  /** The drawn value of every free parameter of the true model, by name. */
  readonly truth: Readonly<Record<string, number>>;
}

/** draws.json of a calibration folder. */
export interface CalibrationDrawsRecord {
  readonly format: 'arcsift calibration draws';
  readonly config: string;
  readonly configSha256: string;
  readonly seed: number;
  readonly draws: readonly CalibrationDraw[];
}

// Stream numbers of derivedSeed: each draw's prior draw and noise have their own streams, so a
// draw does not change when more draws are added.
const PRIOR_STREAM = 0;
const NOISE_STREAM = 1_000_000;

/**
 * Prior draws of the model with `perturberCount` perturbers: each a uniform point of the unit
 * cube sent through the model's prior transform, the same map the nested sampler uses (priors,
 * region priors on positions, ordering of identical perturbers), so the draws follow the prior
 * the fit assumes. The returned function makes one draw from `stream`: the free parameters by name.
 */
export function priorSampler(config: ArcsiftConfig, perturberCount: number): (stream: SeededStream) => Record<string, number> {
  const system = buildLensSystem(config, { perturberCount });
  const space = modelParameterSpace(system);
  const { transform } = modelPriorTransform(system, space, observationAsData(config));
  const unit = new Float64Array(space.dim);
  const physical = new Float64Array(space.physicalDim);
  return (stream) => {
    for (let k = 0; k < space.dim; k++) unit[k] = stream.uniform();
    transform(unit, physical);
    return Object.fromEntries(Array.from(space.freeIndices, (index) => [space.names[index], physical[index]]));
  };
}

/**
 * The calibration's draws: `withPerturber` draws of the whole model and `without` of the smooth
 * one, interleaved (draw-0001, null-0001, draw-0002, ...) so that a batch stopped part way has
 * finished draws of both kinds.
 */
export function planCalibrationDraws(config: ArcsiftConfig, withPerturber: number, without: number, seed: number): CalibrationDraw[] {
  const samplers = { perturbed: priorSampler(config, config.perturbers.length), smooth: priorSampler(config, 0) };
  const make = (k: number, perturbed: boolean): CalibrationDraw => {
    const stream = (perturbed ? 0 : 500_000) + k;
    return {
      id: `${perturbed ? 'draw' : 'null'}-${String(k + 1).padStart(4, '0')}`,
      withPerturber: perturbed,
      noiseSeed: derivedSeed(seed, NOISE_STREAM + stream),
      truth: (perturbed ? samplers.perturbed : samplers.smooth)(SeededStream.fromSeed(derivedSeed(seed, PRIOR_STREAM + stream))),
    };
  };
  const draws: CalibrationDraw[] = [];
  for (let k = 0; k < Math.max(withPerturber, without); k++) {
    if (k < withPerturber) draws.push(make(k, true));
    if (k < without) draws.push(make(k, false));
  }
  return draws;
}

export function readCalibrationDraws(file: string): CalibrationDrawsRecord {
  if (!existsSync(file)) throw new InputError('not a calibration folder: draws.json not found', { file });
  return JSON.parse(readFileSync(file, 'utf8')) as CalibrationDrawsRecord;
}

/** The data folder of a draw inside the calibration folder. */
export function drawDataFolder(out: string, id: string): string {
  return join(out, 'draws', id);
}

/**
 * Simulates every draw whose data folder lacks truth.json (written last by simulateToFolder), with
 * `simulate`'s noise model, and writes draws.json. Returns how many were simulated now.
 */
export function simulateCalibrationDraws(config: ArcsiftConfig, record: CalibrationDrawsRecord, out: string): number {
  writeJsonAtomic(join(out, 'draws.json'), record);
  let made = 0;
  for (const draw of record.draws) {
    const folder = drawDataFolder(out, draw.id);
    if (existsSync(join(folder, 'truth.json'))) continue;
    const scenario = configWithValues(config, new Map(Object.entries(draw.truth)), draw.withPerturber ? config.perturbers.length : 0);
    // No truth.json: a simulation cut short (or none); its partial files are replaced.
    simulateToFolder(scenario, folder, { seed: draw.noiseSeed, noiseless: false, overwrite: true });
    made++;
  }
  return made;
}
