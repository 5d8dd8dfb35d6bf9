import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { InputError } from '../errors.js';
import { createConvolver } from '../imaging/convolver.js';
import { pixelGrid } from '../imaging/pixelGrid.js';
import { ForwardModel } from '../forward/forwardModel.js';
import { separablePsf } from '../forward/separablePsf.js';
import { trimPsfKernel } from '../forward/trimPsfKernel.js';
import { SourceInversion } from '../inversion/sourceInversion.js';
import { buildLensSystem, type LensSystem } from '../model/lensSystem.js';
import type { PixelatedSourceTerm } from '../model/pixelatedSourceTerm.js';
import { MarginalisedAmplitudes } from './marginalisedAmplitudes.js';
import { growMaskByKernel } from './growMaskByKernel.js';

/** The pixelated source's PSF cut: at most this fraction of the least noise left out anywhere. */
export const INVERSION_NOISE_FRACTION = 0.01;

/**
 * The pixel likelihood of one model (smooth, or with the config's first `perturberCount`
 * perturbers) given observed data: light is computed only where it can reach a used pixel
 * through the PSF, the linear amplitudes are marginalised (MarginalisedAmplitudes), and
 * ln L is fully normalised over the used pixels. With a pixelated source the source cells are
 * marginalised jointly with the amplitudes (SourceInversion), and ln L is that evidence.
 * One instance per thread; buffers reused.
 */
export class PixelLikelihood {
  readonly system: LensSystem;
  readonly forward: ForwardModel;
  readonly marginal: MarginalisedAmplitudes;
  /** The pixelated source's inversion, when the model has one. */
  readonly inversion: SourceInversion | undefined;
  private readonly used: Int32Array;

  constructor(config: ArcsiftConfig, data: ObservedData, perturberCount: number) {
    const observation = config.observation;
    if (data.columns !== observation.columns || data.rows !== observation.rows) {
      throw new InputError(
        `the data are ${data.columns} x ${data.rows} pixels but the config's observation says ${observation.columns} x ${observation.rows}`,
        { file: config.file, key: 'observation' },
      );
    }
    checkBrightShare(config, data);
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
    const term = this.system.pixelatedSource;
    let leastNoise = Number.POSITIVE_INFINITY;
    for (let k = 0; k < n; k++) leastNoise = Math.min(leastNoise, sigma[k]);
    // The PSF cut where what it leaves out changes no pixel by more than INVERSION_NOISE_FRACTION
    // of the least noise (trimPsfKernel's bound): the blurred mapping's rows, and so the coupling
    // of the source cells, shrink with the kernel's area. Where the cut kernel is a product of
    // its two marginals within the same bound (separablePsf), the blur runs in two passes; the
    // two approximations then add, to at most twice that fraction.
    const budget = peakBrightness > 0 ? (INVERSION_NOISE_FRACTION * leastNoise) / peakBrightness : 0;
    const kernel = trimPsfKernel(data.psf, budget).kernel;
    this.inversion = term === undefined ? undefined : new SourceInversion({
      grid,
      computed: this.forward.computedPixels,
      used: this.used,
      kernel,
      separable: separablePsf(kernel, budget),
      data: values,
      inverseVariance: Float64Array.from(sigma, (s) => 1 / (s * s)),
      massTerms: this.system.massTerms.map((t) => ({ profile: t.fast ?? t.profile, offset: t.offset })),
      term,
      extraCount: this.system.amplitudeCount,
      amplitudePriorSigma: config.amplitudePriorSigma,
      brightPixels: brightPixelsOf(term, data),
    });
  }

  /** ln L of one model vector (amplitudes marginalised); -Infinity for an impossible model. */
  logLikelihood(model: Float64Array): number {
    // The analytic bases at the used pixels (basis k at k * n + e), as the forward model leaves them.
    const bases = this.forward.computeUsedBasis(model);
    const value = this.inversion === undefined
      ? this.marginal.logLikelihood(bases)
      : this.inversion.logEvidence(this.forward.profileVector, bases);
    return Number.isFinite(value) ? value : Number.NEGATIVE_INFINITY;
  }

  /**
   * The model image at the posterior-mean amplitudes (and, with a pixelated source, the
   * posterior-mean source) of `model`, over the whole grid.
   */
  modelImage(model: Float64Array): { image: Float64Array; amplitudes: Float64Array; logLikelihood: number } {
    const logLikelihood = this.logLikelihood(model);
    const image = new Float64Array(this.forward.pixelCount);
    let amplitudes: Float64Array;
    if (this.inversion === undefined) {
      amplitudes = Float64Array.from(this.marginal.amplitudes);
    } else {
      const cells = this.inversion.sourceCellCount;
      amplitudes = Float64Array.from(this.inversion.lastSolution.subarray(cells, cells + this.system.amplitudeCount));
      if (Number.isFinite(logLikelihood)) {
        const lensed = new Float64Array(this.forward.pixelCount);
        this.inversion.addLensedSource(lensed);
        const { columns, rows } = this.forward.grid;
        createConvolver(columns, rows, this.forward.convolvedPsf).convolve(lensed, image);
      }
    }
    // The likelihood left the whole-grid bases as they were: compute them for this model.
    const basis = this.forward.computeBasis(model);
    for (let k = 0; k < amplitudes.length; k++) {
      for (let p = 0; p < image.length; p++) image[p] += amplitudes[k] * basis[k * image.length + p];
    }
    return { image, amplitudes, logLikelihood };
  }
}

/** The used pixels whose data exceed `ratio` times their noise: where a bright share puts its cells. */
function brightUsedPixels(data: ObservedData, ratio: number): Int32Array {
  return data.usedPixels.filter((p) => data.image[p] > ratio * data.noise[p]);
}

/** The bright pixels of a pixelated source's adaptive mesh with a bright share (undefined otherwise). */
function brightPixelsOf(term: PixelatedSourceTerm | undefined, data: ObservedData): Int32Array | undefined {
  const mesh = term?.settings.mesh;
  return mesh?.kind === 'adaptive' && mesh.brightShare > 0 ? brightUsedPixels(data, mesh.brightSignalToNoise) : undefined;
}

/**
 * An InputError naming the key when a pixelated source's adaptive mesh puts a share of its cells
 * on bright pixels and no used pixel's data exceed brightSignalToNoise times their noise.
 */
export function checkBrightShare(config: ArcsiftConfig, data: ObservedData): void {
  for (const component of config.sourceLight) {
    const mesh = component.pixelated?.mesh;
    if (mesh?.kind !== 'adaptive' || mesh.brightShare === 0) continue;
    const ratio = mesh.brightSignalToNoise;
    if (brightUsedPixels(data, ratio).length > 0) continue;
    throw new InputError(
      `no used pixel's data exceed ${ratio} times their noise, so brightShare has no bright pixels to put cells on; lower brightSignalToNoise or drop brightShare`,
      { file: config.file, key: `${component.key}.mesh.brightSignalToNoise` },
    );
  }
}
