import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { InputError } from '../errors.js';
import { pixelGrid } from '../imaging/pixelGrid.js';
import { ForwardModel } from '../forward/forwardModel.js';
import { buildLensSystem, type LensSystem } from '../model/lensSystem.js';
import { MarginalisedAmplitudes } from './marginalisedAmplitudes.js';
import { growMaskByKernel } from './growMaskByKernel.js';

/**
 * The pixel likelihood of one model (smooth, or with the config's first `perturberCount`
 * perturbers) given observed data: light is computed only where it can reach a used pixel
 * through the PSF, the linear amplitudes are marginalised (MarginalisedAmplitudes), and
 * ln L is fully normalised over the used pixels. One instance per thread; buffers reused.
 */
export class PixelLikelihood {
  readonly system: LensSystem;
  readonly forward: ForwardModel;
  readonly marginal: MarginalisedAmplitudes;
  private readonly used: Int32Array;
  private readonly packed: Float64Array;

  constructor(config: ArcsiftConfig, data: ObservedData, perturberCount: number) {
    const observation = config.observation;
    if (data.columns !== observation.columns || data.rows !== observation.rows) {
      throw new InputError(
        `the data are ${data.columns} x ${data.rows} pixels but the config's observation says ${observation.columns} x ${observation.rows}`,
        { file: config.file, key: 'observation' },
      );
    }
    this.system = buildLensSystem(config, { perturberCount });
    const grid = pixelGrid(data.columns, data.rows, data.pixelScaleArcsec);
    const computed = growMaskByKernel(data.mask, data.columns, data.rows, data.psf.columns, data.psf.rows);
    let peakBrightness = 0;
    for (let k = 0; k < data.usedPixels.length; k++) peakBrightness = Math.max(peakBrightness, data.image[data.usedPixels[k]]);
    this.forward = new ForwardModel(this.system, grid, observation.supersampling, data.psf, {
      computed, used: data.usedPixels, noise: data.noise, peakBrightness,
    });
    this.used = data.usedPixels;
    const n = this.used.length;
    const values = new Float64Array(n);
    const sigma = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      values[k] = data.image[this.used[k]];
      sigma[k] = data.noise[this.used[k]];
    }
    this.marginal = new MarginalisedAmplitudes(values, sigma, this.system.amplitudeCount, config.amplitudePriorSigma);
    this.packed = new Float64Array(this.system.amplitudeCount * n);
  }

  /** ln L of one model vector (amplitudes marginalised); -Infinity for an impossible model. */
  logLikelihood(model: Float64Array): number {
    const basis = this.forward.computeBasis(model);
    const n = this.used.length;
    const count = this.forward.pixelCount;
    const packed = this.packed;
    for (let k = 0; k < this.system.amplitudeCount; k++) {
      const row = k * count;
      const out = k * n;
      for (let e = 0; e < n; e++) packed[out + e] = basis[row + this.used[e]];
    }
    const value = this.marginal.logLikelihood(packed);
    return Number.isFinite(value) ? value : Number.NEGATIVE_INFINITY;
  }

  /**
   * The model image at the posterior-mean amplitudes of `model` (the amplitudes that maximise
   * the amplitude posterior given the other parameters), over the whole grid.
   */
  modelImage(model: Float64Array): { image: Float64Array; amplitudes: Float64Array; logLikelihood: number } {
    const logLikelihood = this.logLikelihood(model);
    const amplitudes = Float64Array.from(this.marginal.amplitudes);
    const image = new Float64Array(this.forward.pixelCount);
    const basis = this.forward.basis;
    for (let k = 0; k < amplitudes.length; k++) {
      for (let p = 0; p < image.length; p++) image[p] += amplitudes[k] * basis[k * image.length + p];
    }
    return { image, amplitudes, logLikelihood };
  }
}
