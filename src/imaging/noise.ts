import { InputError, expectedFound } from '../errors.js';
import { SeededStream } from '../numeric/random/seededStream.js';

/**
 * Per-pixel 1-sigma noise of an image in counts (electrons) per second:
 * sigma = sqrt(skySigma^2 + max(model, 0) / integrationSeconds).
 * The source's Poisson variance is model * t electrons^2, i.e. model / t in (electrons / s)^2
 * (Poisson statistics of photo-electrons, common practice); skySigma (electrons / s)
 * carries sky and read noise. Negative model values add no Poisson term.
 */
export function noiseSigmaMap(
  model: Float64Array, skySigma: number, integrationSeconds: number, sigma: Float64Array,
): void {
  if (!(skySigma >= 0) || !Number.isFinite(skySigma)) {
    throw new InputError(expectedFound('a sky sigma >= 0', skySigma), { key: 'observation.noise.skySigma' });
  }
  if (!(integrationSeconds > 0)) {
    throw new InputError(expectedFound('an integration time in seconds > 0', integrationSeconds), {
      key: 'observation.noise.integrationSeconds',
    });
  }
  const background2 = skySigma * skySigma;
  const inverseTime = 1 / integrationSeconds;
  for (let k = 0; k < model.length; k++) sigma[k] = Math.sqrt(background2 + Math.max(model[k], 0) * inverseTime);
}

/**
 * Writes image + sigma * N(0, 1) into out (out may be image), with the normal deviates of the
 * seeded stream (SeededStream): the same seed gives the same noise on every run and platform.
 */
export function addGaussianNoise(image: Float64Array, sigma: Float64Array, seed: number, out: Float64Array): void {
  if (!Number.isInteger(seed) || seed < 1 || seed > 0xffffffff) {
    throw new InputError(expectedFound('a whole-number seed from 1 to 4294967295', seed), { key: 'seed' });
  }
  const stream = SeededStream.fromSeed(seed);
  for (let k = 0; k < image.length; k++) out[k] = image[k] + sigma[k] * stream.normal();
}
