import type { PixelGrid } from '../imaging/pixelGrid.js';
import { fillSubsetCentres } from '../imaging/pixelGrid.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import { FftConvolver } from '../imaging/convolver.js';
import type { LensSystem } from './lensSystem.js';

export interface ForwardModelOptions {
  /**
   * Pixels whose light is computed (1 = computed); light elsewhere is taken as zero before the
   * PSF. A fit passes its mask grown by the PSF's half-size, which changes nothing inside the
   * mask. Default: every pixel.
   */
  readonly computed?: Uint8Array;
}

/**
 * From a model vector to pixel images: rays from every sub-pixel of the computed pixels are
 * traced to the source plane (beta = theta - alpha(theta)), the source and lens light evaluated
 * at unit amplitude for each linear amplitude, averaged over the sub-pixels, scaled by the pixel
 * area (images are in counts per second per pixel, amplitudes per arcsec^2) and convolved with
 * the PSF. Every buffer is allocated here once; evaluations allocate nothing.
 */
export class ForwardModel {
  readonly system: LensSystem;
  readonly grid: PixelGrid;
  readonly supersampling: number;
  readonly pixelCount: number;
  readonly amplitudeCount: number;
  /** Row-major indices of the computed pixels. */
  readonly computedPixels: Int32Array;
  /** PSF-convolved unit-amplitude images: basis k of pixel p at basis[k * pixelCount + p]. */
  readonly basis: Float64Array;
  private readonly subCount: number;
  private readonly x: Float64Array;
  private readonly y: Float64Array;
  private readonly alphaX: Float64Array;
  private readonly alphaY: Float64Array;
  private readonly betaX: Float64Array;
  private readonly betaY: Float64Array;
  private readonly fine: Float64Array;
  private readonly unconvolved: Float64Array;
  private readonly profile: Float64Array;
  private readonly convolver: FftConvolver;
  private readonly pixelArea: number;

  constructor(system: LensSystem, grid: PixelGrid, supersampling: number, psf: PsfKernel, options: ForwardModelOptions = {}) {
    this.system = system;
    this.grid = grid;
    this.supersampling = supersampling;
    this.pixelCount = grid.columns * grid.rows;
    this.amplitudeCount = system.amplitudeCount;
    const computed: number[] = [];
    for (let p = 0; p < this.pixelCount; p++) if (options.computed === undefined || options.computed[p] !== 0) computed.push(p);
    this.computedPixels = Int32Array.from(computed);
    this.subCount = computed.length * supersampling * supersampling;
    this.x = new Float64Array(this.subCount);
    this.y = new Float64Array(this.subCount);
    fillSubsetCentres(grid, supersampling, this.computedPixels, this.x, this.y);
    this.alphaX = new Float64Array(this.subCount);
    this.alphaY = new Float64Array(this.subCount);
    this.betaX = new Float64Array(this.subCount);
    this.betaY = new Float64Array(this.subCount);
    this.fine = new Float64Array(this.amplitudeCount * this.subCount);
    this.unconvolved = new Float64Array(this.pixelCount);
    this.basis = new Float64Array(this.amplitudeCount * this.pixelCount);
    this.profile = new Float64Array(system.profileVectorLength);
    this.convolver = new FftConvolver(grid.columns, grid.rows, psf);
    this.pixelArea = grid.pixelScaleArcsec * grid.pixelScaleArcsec;
  }

  /** Source-plane positions of the sub-pixels after the last `computeBasis`. */
  get sourcePlane(): { readonly x: Float64Array; readonly y: Float64Array } {
    return { x: this.betaX, y: this.betaY };
  }

  /** Fills `basis` for the model vector and returns it. */
  computeBasis(model: Float64Array): Float64Array {
    const system = this.system;
    const p = this.profile;
    const n = this.subCount;
    system.writeProfileVector(model, p);
    const ax = this.alphaX;
    const ay = this.alphaY;
    ax.fill(0);
    ay.fill(0);
    for (const term of system.massTerms) term.profile.addDeflection(p, term.offset, this.x, this.y, n, ax, ay);
    const bx = this.betaX;
    const by = this.betaY;
    for (let i = 0; i < n; i++) {
      bx[i] = this.x[i] - ax[i];
      by[i] = this.y[i] - ay[i];
    }
    for (const term of system.sourceTerms) {
      term.profile.writeBasis(p, term.offset, bx, by, n, this.fine, term.amplitudeOffset * n, n);
    }
    for (const term of system.lensLightTerms) {
      term.profile.writeBasis(p, term.offset, this.x, this.y, n, this.fine, term.amplitudeOffset * n, n);
    }
    const run = this.supersampling * this.supersampling;
    const scale = this.pixelArea / run;
    const pixels = this.computedPixels;
    const image = this.unconvolved;
    for (let k = 0; k < this.amplitudeCount; k++) {
      let index = k * n;
      for (let e = 0; e < pixels.length; e++) {
        let sum = 0;
        for (let m = 0; m < run; m++) sum += this.fine[index + m];
        image[pixels[e]] = sum * scale;
        index += run;
      }
      this.convolver.convolve(image, this.basis.subarray(k * this.pixelCount, (k + 1) * this.pixelCount));
    }
    return this.basis;
  }

  /** The model image sum_k amplitudes[k] basis_k for the model vector, into `out`. */
  image(model: Float64Array, amplitudes: Float64Array, out: Float64Array): Float64Array {
    const basis = this.computeBasis(model);
    const count = this.pixelCount;
    out.fill(0);
    for (let k = 0; k < this.amplitudeCount; k++) {
      const a = amplitudes[k];
      const row = k * count;
      for (let q = 0; q < count; q++) out[q] += a * basis[row + q];
    }
    return out;
  }
}
