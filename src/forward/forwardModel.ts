import type { PixelGrid } from '../imaging/pixelGrid.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import type { LensSystem, LightTerm } from '../model/lensSystem.js';
import { AdaptivePixelMeans, type MeanLightTerm } from './adaptivePixelMeans.js';
import { PixelSubsetConvolver } from './pixelSubsetConvolver.js';
import { separablePsf } from './separablePsf.js';
import { trimPsfKernel } from './trimPsfKernel.js';

/** Default relative tolerance of the adaptive pixel means (see AdaptivePixelMeans). */
export const FORWARD_MODEL_RELATIVE_TOLERANCE = 1e-5;
/** Default fraction of the noise asked of the model when a noise map is given. */
export const FORWARD_MODEL_NOISE_FRACTION = 0.003;

export interface ForwardModelOptions {
  /**
   * Pixels whose light is computed (1 = computed); light elsewhere is taken as zero before the
   * PSF. A fit passes its mask grown by the PSF's half-size, which changes nothing inside the
   * mask. Default: every pixel.
   */
  readonly computed?: Uint8Array;
  /**
   * Row-major indices of the pixels whose PSF-convolved values are wanted (a fit's used
   * pixels); the basis is filled there only (zero elsewhere) and light is computed only where
   * the PSF carries it to them. Default: every pixel.
   */
  readonly used?: ArrayLike<number>;
  /**
   * Accuracy asked of each PSF-convolved basis image in every pixel, as a fraction of its peak
   * (see AdaptivePixelMeans; default 1e-5), when no noise map is given. 0 gives the brute-force
   * model: S x S rays in every pixel and the whole PSF kernel.
   */
  readonly relativeTolerance?: number;
  /**
   * Per-pixel 1-sigma noise (whole grid) and the brightest pixel value the model is expected to
   * reach among the used pixels (e.g. the data's): the tolerance at a pixel becomes
   * noiseFraction * (least noise of the used pixels the PSF carries its light to) /
   * peakBrightness, relative to each basis peak. A component of peak <= peakBrightness then errs
   * by about noiseFraction times the noise or less (default 0.003, a third of the 1% criterion
   * of test/forward/forwardAccuracy.test.ts, where the largest error met, over the demo, a compact
   * source and random draws from the demo's priors, is 0.26% of the noise).
   */
  readonly noise?: ArrayLike<number>;
  /** See `noise`; ignored (relativeTolerance used) unless finite and > 0. */
  readonly peakBrightness?: number;
  readonly noiseFraction?: number;
}

/** Where a light term's bases sit among the amplitudes and in an evaluator's basis list. */
interface BoundLightTerm {
  readonly term: LightTerm;
  readonly imagePlane: boolean;
  /** True when every profile-vector entry it depends on is fixed (no prior). */
  readonly fixed: boolean;
}

/**
 * From a model vector to pixel images: each pixel's light is the mean of the source (traced
 * through the lens, beta = theta - alpha(theta)) and lens light at unit amplitude over S x S
 * sub-pixels, S = supersampling, scaled by the pixel area (images are in counts per second per
 * pixel, amplitudes per arcsec^2) and convolved with the PSF.
 *
 * The same image is computed faster than by S^2 rays per pixel, within a stated tolerance:
 * - pixel means adaptively (AdaptivePixelMeans): one ray per pixel where a stencil over the
 *   neighbouring pixel centres predicts the S x S mean, more rays only where it cannot;
 * - light terms whose parameters are all fixed (no prior) are computed once, brute force, and
 *   their convolved basis kept until their profile-vector entries change;
 * - sub-pixel rays of pixels where the lens mapping is smooth are not traced: their source-plane
 *   positions are interpolated from the pixel-centre rays;
 * - each profile runs as its registered fast evaluation (MassProfilePair, LightProfilePair): the
 *   isothermal ellipsoid, the truncated NFW and the Sersic profile with table-driven atan, log,
 *   exp and powers, the truncated NFW's radial factor from a table (each tested against its
 *   reference beside it);
 * - the PSF is cut to the box outside which |K| sums to 1/20 of the least relative tolerance
 *   (trimPsfKernel), convolved as two 1-D passes when separable to the same budget
 *   (separablePsf), and only at the `used` pixels (PixelSubsetConvolver); light is computed only
 *   within the cut kernel's reach of them.
 * Every buffer is allocated here; evaluations create no arrays or objects.
 */
export class ForwardModel {
  readonly system: LensSystem;
  readonly grid: PixelGrid;
  readonly supersampling: number;
  readonly pixelCount: number;
  readonly amplitudeCount: number;
  /** Row-major indices of the pixels whose light is computed. */
  readonly computedPixels: Int32Array;
  /** Row-major indices of the pixels where `basis` is filled. */
  readonly usedPixels: Int32Array;
  /**
   * PSF-convolved unit-amplitude images: basis k of pixel p at basis[k * pixelCount + p], after
   * computeBasis (computeUsedBasis leaves them).
   */
  readonly basis: Float64Array;
  /**
   * The same images at the used pixels only, after computeBasis or computeUsedBasis: basis k at
   * the e-th used pixel at usedBasis[k * usedPixels.length + e] (what a likelihood over the used
   * pixels reads).
   */
  readonly usedBasis: Float64Array;
  /** Relative tolerance of each computed pixel (see ForwardModelOptions). */
  readonly relativeTolerance: Float64Array;
  /** The PSF as convolved (cut to its support), and whether it runs as two 1-D passes. */
  readonly convolvedPsf: PsfKernel;
  readonly separable: boolean;
  /** Pixel means of the light terms with sampled parameters (adaptive). */
  readonly varying: AdaptivePixelMeans;
  /** Pixel means of the light terms whose parameters are all fixed (brute force, cached). */
  readonly fixed: AdaptivePixelMeans;
  private readonly varyingAmplitudes: Int32Array;
  private readonly fixedAmplitudes: Int32Array;
  /** Profile-vector entries the fixed terms depend on, and their values when last computed. */
  private readonly fixedSlots: Int32Array;
  private readonly fixedSlotValues: Float64Array;
  private fixedValid = false;
  private readonly profile: Float64Array;
  private readonly convolver: PixelSubsetConvolver;
  private readonly inputPadded: Int32Array;
  private readonly pixelArea: number;

  constructor(system: LensSystem, grid: PixelGrid, supersampling: number, psf: PsfKernel, options: ForwardModelOptions = {}) {
    if (!Number.isInteger(supersampling) || supersampling < 1) throw new RangeError(`supersampling must be a whole number >= 1, got ${supersampling}`);
    this.system = system;
    this.grid = grid;
    this.supersampling = supersampling;
    this.pixelCount = grid.columns * grid.rows;
    this.amplitudeCount = system.amplitudeCount;
    this.profile = new Float64Array(system.profileVectorLength);
    this.pixelArea = grid.pixelScaleArcsec * grid.pixelScaleArcsec;

    this.usedPixels = options.used === undefined
      ? Int32Array.from({ length: this.pixelCount }, (_, p) => p)
      : Int32Array.from(options.used);
    const usedTolerance = usedPixelTolerance(this.usedPixels, options);
    // The kernel cut and factorisation each cost at most budget * max|image| (trimPsfKernel).
    let kernelBudget = Number.POSITIVE_INFINITY;
    for (const value of usedTolerance) kernelBudget = Math.min(kernelBudget, value / 20);
    if (!Number.isFinite(kernelBudget)) kernelBudget = 0;
    const trimmed = trimPsfKernel(psf, kernelBudget).kernel;
    const factors = separablePsf(trimmed, kernelBudget);
    this.convolvedPsf = trimmed;
    this.separable = factors !== undefined;
    this.convolver = new PixelSubsetConvolver(grid.columns, grid.rows, trimmed, this.usedPixels, factors);
    this.computedPixels = reachingPixels(grid, this.usedPixels, this.convolver.halfX, this.convolver.halfY, options.computed);
    this.relativeTolerance = computedPixelTolerance(
      grid, this.usedPixels, usedTolerance, this.computedPixels, this.convolver.halfX, this.convolver.halfY,
    );
    this.inputPadded = this.computedPixels.map((p) => this.convolver.paddedIndex(p));
    this.basis = new Float64Array(this.amplitudeCount * this.pixelCount);
    this.usedBasis = new Float64Array(this.amplitudeCount * this.usedPixels.length);

    const bound = bindLightTerms(system);
    const massTerms = system.massTerms.map((term) => ({ profile: term.fast ?? term.profile, offset: term.offset }));
    const build = (terms: BoundLightTerm[], uniform: boolean): [AdaptivePixelMeans, Int32Array] => {
      const amplitudes: number[] = [];
      const meanTerms: MeanLightTerm[] = terms.map(({ term, imagePlane }) => {
        const firstBasis = amplitudes.length;
        for (let b = 0; b < term.profile.basisCount; b++) amplitudes.push(term.amplitudeOffset + b);
        return { profile: term.fast, offset: term.offset, firstBasis, imagePlane };
      });
      const means = new AdaptivePixelMeans(
        grid, supersampling, this.computedPixels, massTerms, meanTerms, amplitudes.length, this.relativeTolerance,
        trimmed, uniform,
      );
      return [means, Int32Array.from(amplitudes)];
    };
    const fixedTerms = bound.filter((t) => t.fixed);
    [this.varying, this.varyingAmplitudes] = build(bound.filter((t) => !t.fixed), kernelBudget === 0);
    [this.fixed, this.fixedAmplitudes] = build(fixedTerms, true);
    const slots = new Set<number>();
    for (const { term, imagePlane } of fixedTerms) {
      for (let k = 0; k < term.profile.parameterNames.length; k++) slots.add(term.offset + k);
      if (!imagePlane) for (const slot of massSlots(system)) slots.add(slot);
    }
    this.fixedSlots = Int32Array.from([...slots].sort((a, b) => a - b));
    this.fixedSlotValues = new Float64Array(this.fixedSlots.length);
  }

  /** The profile vector of the last computeBasis (read only). */
  get profileVector(): Float64Array {
    return this.profile;
  }

  /**
   * Source-plane positions of the pixel-centre rays (the lattice of AdaptivePixelMeans: the
   * computed pixels and a two-pixel ring) after the last `computeBasis`.
   */
  get sourcePlane(): { readonly x: Float64Array; readonly y: Float64Array } {
    return this.varying.latticeSourcePlane;
  }

  /** Fills `basis` (and `usedBasis`) for the model vector and returns `basis`. */
  computeBasis(model: Float64Array): Float64Array {
    this.evaluateBases(model, true);
    return this.basis;
  }

  /**
   * Fills `usedBasis` only for the model vector and returns it: what a likelihood reads. `basis`
   * is left as it was for the varying bases until the next computeBasis, which spares the copy of
   * every basis onto the whole grid (66 x 5,160 writes a call for shapelets of order 10).
   */
  computeUsedBasis(model: Float64Array): Float64Array {
    this.evaluateBases(model, false);
    return this.usedBasis;
  }

  /**
   * The fixed bases when their parameters changed (always onto the whole grid as well: they are
   * rarely redone, and computeBasis may later skip them), then the varying ones, onto the whole
   * grid when `whole`.
   */
  private evaluateBases(model: Float64Array, whole: boolean): void {
    const p = this.profile;
    this.system.writeProfileVector(model, p);
    if (this.fixedAmplitudes.length > 0 && !this.fixedUpToDate(p)) {
      this.fixed.evaluate(p);
      this.convolveMeans(this.fixed, this.fixedAmplitudes, true);
      this.fixedValid = true;
    }
    if (this.varyingAmplitudes.length > 0) {
      this.varying.evaluate(p);
      this.convolveMeans(this.varying, this.varyingAmplitudes, whole);
    }
  }

  /** The model image sum_k amplitudes[k] basis_k for the model vector, into `out`. */
  image(model: Float64Array, amplitudes: Float64Array, out: Float64Array): Float64Array {
    const basis = this.computeBasis(model);
    const count = this.pixelCount;
    const used = this.usedPixels;
    // The basis is zero outside the used pixels.
    out.fill(0);
    for (let k = 0; k < this.amplitudeCount; k++) {
      const a = amplitudes[k];
      const row = k * count;
      for (let e = 0; e < used.length; e++) {
        const q = used[e];
        out[q] += a * basis[row + q];
      }
    }
    return out;
  }

  private fixedUpToDate(p: Float64Array): boolean {
    const slots = this.fixedSlots;
    const values = this.fixedSlotValues;
    let same = this.fixedValid;
    for (let k = 0; k < slots.length; k++) {
      if (values[k] !== p[slots[k]]) same = false;
      values[k] = p[slots[k]];
    }
    return same;
  }

  /**
   * Each basis's means convolved with the PSF into `usedBasis` and, when `whole`, into `basis`:
   * two at a time where the convolver can.
   */
  private convolveMeans(means: AdaptivePixelMeans, amplitudes: Int32Array, whole: boolean): void {
    const output = whole ? this.basis : null;
    let k = 0;
    if (this.convolver.hasPairs) {
      for (; k + 1 < amplitudes.length; k += 2) {
        this.copyMeansPair(means.means, k * this.inputPadded.length);
        const used = this.usedPixels.length;
        this.convolver.convolvePair(
          output, amplitudes[k] * this.pixelCount, amplitudes[k + 1] * this.pixelCount, this.usedBasis, amplitudes[k] * used, amplitudes[k + 1] * used,
        );
      }
    }
    for (; k < amplitudes.length; k++) {
      this.copyMeans(means.means, k * this.inputPadded.length);
      this.convolver.convolve(output, amplitudes[k] * this.pixelCount, this.usedBasis, amplitudes[k] * this.usedPixels.length);
    }
  }

  /** copyMeans for two consecutive bases (from `from` and the next basis) into the convolver's pairInput. */
  private copyMeansPair(values: Float64Array, from: number): void {
    const input = this.convolver.pairInput;
    const padded = this.inputPadded;
    const area = this.pixelArea;
    const next = from + padded.length;
    for (let e = 0; e < padded.length; e++) {
      const q = 2 * padded[e];
      input[q] = values[from + e] * area;
      input[q + 1] = values[next + e] * area;
    }
  }

  /**
   * Pixel means (from `from` on) times the pixel area into the convolver's padded input (a loop
   * in a method of its own; see latticeLevel in adaptivePixelMeans.ts).
   */
  private copyMeans(values: Float64Array, from: number): void {
    const input = this.convolver.input;
    const padded = this.inputPadded;
    const area = this.pixelArea;
    for (let e = 0; e < padded.length; e++) input[padded[e]] = values[from + e] * area;
  }
}

/** Relative tolerance of each used pixel (see ForwardModelOptions). */
function usedPixelTolerance(used: Int32Array, options: ForwardModelOptions): Float64Array {
  const { noise, peakBrightness } = options;
  if (noise === undefined || peakBrightness === undefined || !(peakBrightness > 0) || !Number.isFinite(peakBrightness)) {
    return new Float64Array(used.length).fill(options.relativeTolerance ?? FORWARD_MODEL_RELATIVE_TOLERANCE);
  }
  const fraction = options.noiseFraction ?? FORWARD_MODEL_NOISE_FRACTION;
  return Float64Array.from(used, (p) => (fraction * noise[p]) / peakBrightness);
}

/** For each computed pixel, the least tolerance of the used pixels within (halfX, halfY) of it. */
function computedPixelTolerance(
  grid: PixelGrid, used: Int32Array, usedTolerance: Float64Array, computed: Int32Array, halfX: number, halfY: number,
): Float64Array {
  const { columns, rows } = grid;
  const least = new Float64Array(columns * rows).fill(Number.POSITIVE_INFINITY);
  used.forEach((p, e) => {
    const i = p % columns;
    const j = (p - i) / columns;
    for (let b = Math.max(0, j - halfY); b <= Math.min(rows - 1, j + halfY); b++) {
      for (let a = Math.max(0, i - halfX); a <= Math.min(columns - 1, i + halfX); a++) {
        least[b * columns + a] = Math.min(least[b * columns + a], usedTolerance[e]);
      }
    }
  });
  return Float64Array.from(computed, (p) => least[p]);
}

/** Pixels within (halfX, halfY) of a used pixel (a square footprint), and computed. */
function reachingPixels(grid: PixelGrid, used: Int32Array, halfX: number, halfY: number, computed?: Uint8Array): Int32Array {
  const { columns, rows } = grid;
  const reach = new Uint8Array(columns * rows);
  for (const p of used) {
    const i = p % columns;
    const j = (p - i) / columns;
    for (let b = Math.max(0, j - halfY); b <= Math.min(rows - 1, j + halfY); b++) {
      for (let a = Math.max(0, i - halfX); a <= Math.min(columns - 1, i + halfX); a++) reach[b * columns + a] = 1;
    }
  }
  const list: number[] = [];
  for (let p = 0; p < reach.length; p++) if (reach[p] === 1 && (computed === undefined || computed[p] !== 0)) list.push(p);
  return Int32Array.from(list);
}

/** Profile-vector entries read by the mass terms. */
function massSlots(system: LensSystem): number[] {
  const slots: number[] = [];
  for (const term of system.massTerms) for (let k = 0; k < term.profile.parameterNames.length; k++) slots.push(term.offset + k);
  return slots;
}

/**
 * Which light terms depend only on fixed parameters: the model vector is filled with NaN at
 * every parameter that has a prior (and any without a value), the profile vector written, and a
 * term is fixed when none of its entries (and, for source light, none of the mass entries) came
 * out NaN. Checked again at every evaluation by comparing the entries (fixedUpToDate).
 */
function bindLightTerms(system: LensSystem): BoundLightTerm[] {
  const probe = system.configuredValues();
  system.parameters.forEach((parameter, index) => {
    if (parameter.prior !== undefined) probe[index] = Number.NaN;
  });
  const profile = new Float64Array(system.profileVectorLength);
  let probed = true;
  try {
    system.writeProfileVector(probe, profile);
  } catch {
    probed = false;
  }
  const finite = (slots: number[]): boolean => probed && slots.every((slot) => Number.isFinite(profile[slot]));
  const massFixed = finite(massSlots(system));
  const termSlots = (term: LightTerm): number[] => Array.from(term.profile.parameterNames, (_, k) => term.offset + k);
  return [
    ...system.sourceTerms.map((term) => ({ term, imagePlane: false, fixed: massFixed && finite(termSlots(term)) })),
    ...system.lensLightTerms.map((term) => ({ term, imagePlane: true, fixed: finite(termSlots(term)) })),
  ];
}
