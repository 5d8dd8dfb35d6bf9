import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { InputError } from '../errors.js';
import type { PixelGrid } from '../imaging/pixelGrid.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import { noiseSigmaMap, addGaussianNoise } from '../imaging/noise.js';
import { ForwardModel } from '../forward/forwardModel.js';
import { buildLensSystem, type LensSystem } from '../model/lensSystem.js';
import { gridOfObservation, maskOfObservation, psfOfObservation } from '../model/observationSetup.js';
import type { PerturberDerived } from '../model/perturberBinding.js';

export interface SimulationOptions {
  readonly seed: number;
  readonly noiseless: boolean;
}

/** A mock observation and the truth that made it. */
export interface Simulation {
  readonly grid: PixelGrid;
  readonly psf: PsfKernel;
  /** Observed image (model plus noise unless noiseless), counts per second per pixel. */
  readonly image: Float64Array;
  /** The noiseless model image. */
  readonly model: Float64Array;
  /** Per-pixel 1-sigma noise. */
  readonly noise: Float64Array;
  readonly mask: Uint8Array;
  readonly system: LensSystem;
  readonly truthVector: Float64Array;
  readonly amplitudes: Float64Array;
  readonly perturbers: readonly (PerturberDerived & { key: string })[];
}

/** Simulates the config's scenario: every parameter at its configured `value`. */
export function simulateObservation(config: ArcsiftConfig, options: SimulationOptions): Simulation {
  const system = buildLensSystem(config, { purpose: 'simulate' });
  const truthVector = system.configuredValues();
  system.parameters.forEach((parameter, index) => {
    if (Number.isNaN(truthVector[index])) {
      throw new InputError('simulate needs a value for every parameter (this one has only a prior)', { file: config.file, key: parameter.name });
    }
  });
  const amplitudes = system.configuredAmplitudes;
  if (amplitudes === undefined) {
    throw new InputError('simulate needs an amplitude (or shapelet coefficients) for every light component', { file: config.file });
  }
  const noiseModel = config.observation.noise;
  if (noiseModel === undefined) {
    throw new InputError('simulate needs a noise model: expected observation.noise { skySigma, integrationSeconds }, found none', { file: config.file, key: 'observation.noise' });
  }
  const grid = gridOfObservation(config.observation);
  const psf = psfOfObservation(config.observation, config.file);
  const mask = maskOfObservation(config.observation.mask, grid);
  const forward = new ForwardModel(system, grid, config.observation.supersampling, psf);
  const model = forward.image(truthVector, amplitudes, new Float64Array(forward.pixelCount));
  const noise = new Float64Array(model.length);
  noiseSigmaMap(model, noiseModel.skySigma, noiseModel.integrationSeconds, noise);
  const image = Float64Array.from(model);
  if (!options.noiseless) addGaussianNoise(model, noise, options.seed, image);
  const perturbers = system.perturbers.map((binding) => ({ key: binding.key, ...binding.derived(truthVector) }));
  return { grid, psf, image, model, noise, mask, system, truthVector, amplitudes, perturbers };
}
