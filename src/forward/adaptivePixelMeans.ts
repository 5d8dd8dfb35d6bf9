import type { PixelGrid } from '../imaging/pixelGrid.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import type { LightProfile } from '../light/lightProfile.js';
import { traceRays } from '../lensing/lensEquation.js';
import type { MassTerm } from '../lensing/massTerm.js';
import { midpointStencilWeights, richardsonFactor } from './midpointStencil.js';

/** A light component as the pixel-mean evaluator sees it. */
export interface MeanLightTerm {
  readonly profile: LightProfile;
  readonly offset: number;
  /** Index of the component's first basis image among the evaluator's bases. */
  readonly firstBasis: number;
  /** True for lens light (evaluated at image-plane positions), false for source light. */
  readonly imagePlane: boolean;
}

/** Rays are traced in batches of this many (a multiple of every S^2 up to S = 64). */
const CHUNK = 4096;
/** Weight of the lower-order correction in the lattice error indicator (see evaluate); 0.1 -> 0.03 cut the demo's rays 22% and raised the worst error of the accuracy test from 0.13% to 0.26% of the noise (bound 1%). */
const LATTICE_GUARD = 0.03;
/** Weight of the Richardson correction in the indicator of the intermediate levels. */
const RICHARDSON_GUARD = 0.03;
/**
 * From the second factor on, the change between two Richardson predictions measures the error of
 * the earlier one; the later one's error is taken as that change over this factor. For light
 * smooth on the sub-pixel scale the extrapolated midpoint error falls as m^-4 (the midpoint
 * rule's error runs in even powers of 1/m), 17-fold from m = 2 to 4 towards S = 8, so 4 leaves
 * a factor of four (test/forward/midpointStencil.test.ts). Measured on every pixel of the demo and
 * compact-source scenarios at their truths: accepted this way, the worst m = 4 error was 0.28 and
 * 0.29 tolerances (0.45 and 0.50 with 8); the demo evaluation went from 1.045 to 0.985 ms
 * (rays after the lattice 23.5 k -> 18.2 k) with the accuracy test's worst errors unchanged to
 * 0.01% of the noise.
 */
export const EXTRAPOLATED_CONVERGENCE = 4;
/**
 * A pixel whose indicator exceeds this many tolerances goes straight to the S x S rays: the next
 * factor cuts the midpoint error about fourfold (m^-2), sixteenfold after extrapolation for
 * smooth light, so it would fail again (in the demo and compact-source scenarios every pixel
 * above 30 tolerances at one level needed S x S). This changes the cost only: S x S is exact.
 */
const HOPELESS = 30;
/** Largest change of the light at a predicted position, in tolerances, that lets a pixel use interpolated rays. */
const INTERPOLATION_GUARD = 5;

/**
 * Mean surface brightness over S x S sub-pixels (S = `supersampling`, the midpoint rule that
 * defines the model's pixel values) of each basis image at a fixed list of pixels, computed
 * adaptively so that most pixels need one ray instead of S^2.
 *
 * 1. One ray through every pixel centre of the listed pixels and of a two-pixel ring around
 *    them (the lattice). For a pixel, the tensor product of the 5-point stencil of
 *    midpointStencil.ts over its 5 x 5 lattice neighbourhood predicts its S x S mean exactly for
 *    every polynomial of degree <= 4 in x and y. The error indicator is the size of the
 *    fourth-order part of that stencil (|x part| + |y part| + |mixed part|, what the 3-point
 *    stencil would have missed) and, as a guard against those parts cancelling by chance where
 *    the light is not smooth on the pixel scale, LATTICE_GUARD (0.03) times the second-order correction.
 * 2. Pixels whose indicator exceeds the tolerance get m x m sub-pixel rays, m = 2, 4, ... below
 *    S. The S-point mean is predicted by Richardson extrapolation from the means at the last two
 *    factors (richardsonFactor); the indicator is the change from the previous prediction
 *    (divided by EXTRAPOLATED_CONVERGENCE when that prediction was itself extrapolated) and
 *    0.03 times the extrapolation step.
 * 3. Pixels still above the tolerance get the S x S rays themselves: the exact model value.
 *    A pixel more than HOPELESS (30) tolerances off at any level goes there directly.
 * Sub-pixel rays are traced only for pixels where interpolating the source-plane positions from
 * the lattice is not safe (checkInterpolation); elsewhere they are interpolated (degree 4).
 *
 * The tolerance of basis k at pixel e is relativeTolerance[e] times the scale of basis k: the
 * PSF-convolved lattice image at the brightest lattice pixel (a lower bound of the convolved
 * peak for light >= 0, the same up to the lattice's own error), so the criterion is scale-free
 * and refers to what is compared with data, the convolved image. The indicators
 * are estimates of the error, not bounds: test/forward/forwardAccuracy.test.ts compares the
 * result with the brute-force S x S model. With `uniform` every pixel gets the S x S rays.
 * Buffers are allocated here; evaluate() creates no arrays or objects.
 */
export class AdaptivePixelMeans {
  readonly pixels: Int32Array;
  readonly basisCount: number;
  /** Per-pixel means after evaluate(): basis k of pixels[e] at means[k * pixels.length + e]. */
  readonly means: Float64Array;
  /** Sub-pixel factors after the lattice, ending with S. */
  readonly factors: Int32Array;
  private readonly richardsonByLevel: Float64Array;
  /** Pixels finished at the lattice (index 0) and at each factor (index l + 1), last evaluate. */
  readonly pixelsByLevel: Int32Array;
  /** Rays traced, and rays whose source-plane position was interpolated, by the last evaluate(). */
  raysTraced = 0;
  raysInterpolated = 0;

  private readonly grid: PixelGrid;
  private readonly supersampling: number;
  private readonly massTerms: readonly MassTerm[];
  private readonly lightTerms: readonly MeanLightTerm[];
  private readonly hasSource: boolean;
  /** Whether a light term is evaluated at image-plane positions (else sub-pixel x, y are only traced). */
  private readonly hasImagePlane: boolean;
  private readonly adaptive: boolean;
  private readonly relativeTolerance: Float64Array;
  private readonly kernel: PsfKernel;
  /** Scale of each basis (see above) after the last evaluate(). */
  readonly scale: Float64Array;
  // Lattice: padded grid with a 2-pixel margin, pixel (i, j) at (j + 2) * width + i + 2.
  private readonly width: number;
  private readonly latticeCount: number;
  private readonly latticePadded: Int32Array;
  private readonly latticeX: Float64Array;
  private readonly latticeY: Float64Array;
  private readonly latticeAx: Float64Array;
  private readonly latticeAy: Float64Array;
  private readonly latticeBx: Float64Array;
  private readonly latticeBy: Float64Array;
  private readonly latticeOut: Float64Array;
  private readonly latticeValues: Float64Array;
  private readonly rowFilterPadded: Int32Array;
  private readonly rowSecond: Float64Array;
  private readonly rowFourth: Float64Array;
  private readonly pixelsPadded: Int32Array;
  private readonly w3: Float64Array;
  private readonly d5: Float64Array;
  // Refinement state per pixel and basis.
  private readonly previous: Float64Array;
  private readonly current: Float64Array;
  private readonly pending: Int32Array;
  /** 0, 1, ..., pixels.length - 1. */
  private readonly allPixels: Int32Array;
  /** Per pixel, after a level: 0 done, 1 refine further, 2 straight to S x S (HOPELESS). */
  private readonly flags: Int32Array;
  /** Pixels sent straight to the S x S rays (HOPELESS), and how many. */
  private readonly direct: Int32Array;
  private directCount = 0;
  // One batch of rays.
  private readonly chunkX = new Float64Array(CHUNK);
  private readonly chunkY = new Float64Array(CHUNK);
  private readonly chunkAx = new Float64Array(CHUNK);
  private readonly chunkAy = new Float64Array(CHUNK);
  private readonly chunkBx = new Float64Array(CHUNK);
  private readonly chunkBy = new Float64Array(CHUNK);
  private readonly chunkOut: Float64Array;
  private readonly chunkPixels = new Int32Array(CHUNK);
  // Interpolation of source-plane positions from the lattice.
  private readonly latticeBetaX: Float64Array;
  private readonly latticeBetaY: Float64Array;
  private readonly interpolable: Uint8Array;
  private readonly rowX = new Float64Array(5 * 64);
  private readonly rowY = new Float64Array(5 * 64);
  private readonly weightsByFactor = new Map<number, Float64Array>();

  constructor(
    grid: PixelGrid, supersampling: number, pixels: Int32Array, massTerms: readonly MassTerm[],
    lightTerms: readonly MeanLightTerm[], basisCount: number, relativeTolerance: Float64Array, kernel: PsfKernel,
    uniform: boolean,
  ) {
    if (supersampling * supersampling > CHUNK) throw new RangeError(`supersampling ${supersampling} above ${Math.sqrt(CHUNK)}`);
    this.grid = grid;
    this.supersampling = supersampling;
    this.pixels = Int32Array.from(pixels);
    this.massTerms = massTerms;
    this.lightTerms = lightTerms;
    this.hasSource = lightTerms.some((term) => !term.imagePlane);
    this.hasImagePlane = lightTerms.some((term) => term.imagePlane);
    this.basisCount = basisCount;
    this.relativeTolerance = relativeTolerance;
    this.kernel = kernel;
    this.adaptive = !uniform && supersampling > 1;
    const count = this.pixels.length;
    this.means = new Float64Array(basisCount * count);
    this.previous = new Float64Array(basisCount * count);
    this.current = new Float64Array(basisCount * count);
    this.pending = new Int32Array(count);
    this.allPixels = Int32Array.from({ length: count }, (_, e) => e);
    this.flags = new Int32Array(count);
    this.direct = new Int32Array(count);
    this.scale = new Float64Array(basisCount);
    this.chunkOut = new Float64Array(Math.max(1, basisCount) * CHUNK);
    this.interpolable = new Uint8Array(count);
    const factors: number[] = [];
    if (this.adaptive) for (let m = 2; m < supersampling; m *= 2) factors.push(m);
    factors.push(supersampling);
    this.factors = Int32Array.from(factors);
    // Richardson factor of each level from the previous factor (1 for the lattice) to this one.
    this.richardsonByLevel = Float64Array.from(factors, (m, level) => richardsonFactor(level === 0 ? 1 : factors[level - 1], m, supersampling));
    this.pixelsByLevel = new Int32Array(factors.length + 1);

    const { columns, rows } = grid;
    const width = columns + 4;
    const height = rows + 4;
    this.width = width;
    this.pixelsPadded = this.pixels.map((p) => {
      const i = p % columns;
      return ((p - i) / columns + 2) * width + i + 2;
    });
    this.w3 = midpointStencilWeights(supersampling, 1);
    const w5 = midpointStencilWeights(supersampling, 2);
    // Fourth-order part of the 5-point weights: w5 minus w3 padded with zeros.
    this.d5 = Float64Array.from([w5[2] - this.w3[1], w5[1] - this.w3[0], w5[0]]);
    if (!this.adaptive) {
      this.latticeCount = 0;
      this.latticePadded = new Int32Array(0);
      this.latticeX = this.latticeY = this.latticeAx = this.latticeAy = this.latticeBx = this.latticeBy = new Float64Array(0);
      this.latticeOut = this.latticeValues = this.rowSecond = this.rowFourth = new Float64Array(0);
      this.rowFilterPadded = new Int32Array(0);
      this.latticeBetaX = this.latticeBetaY = new Float64Array(0);
      return;
    }
    const active = new Uint8Array(width * height);
    const rowFilter = new Uint8Array(width * height);
    for (const q of this.pixelsPadded) {
      for (let b = -2; b <= 2; b++) {
        rowFilter[q + b * width] = 1;
        for (let a = -2; a <= 2; a++) active[q + b * width + a] = 1;
      }
    }
    const latticeList: number[] = [];
    const rowList: number[] = [];
    for (let q = 0; q < active.length; q++) {
      if (active[q] === 1) latticeList.push(q);
      if (rowFilter[q] === 1) rowList.push(q);
    }
    this.latticePadded = Int32Array.from(latticeList);
    this.rowFilterPadded = Int32Array.from(rowList);
    const n = latticeList.length;
    this.latticeCount = n;
    this.latticeX = new Float64Array(n);
    this.latticeY = new Float64Array(n);
    const scale = grid.pixelScaleArcsec;
    for (let e = 0; e < n; e++) {
      const q = latticeList[e];
      const i = (q % width) - 2;
      const j = Math.floor(q / width) - 2;
      this.latticeX[e] = (i - (columns - 1) / 2) * scale;
      this.latticeY[e] = (j - (rows - 1) / 2) * scale;
    }
    this.latticeAx = new Float64Array(n);
    this.latticeAy = new Float64Array(n);
    this.latticeBx = new Float64Array(n);
    this.latticeBy = new Float64Array(n);
    this.latticeOut = new Float64Array(Math.max(1, basisCount) * n);
    this.latticeValues = new Float64Array(Math.max(1, basisCount) * width * height);
    this.rowSecond = new Float64Array(width * height);
    this.rowFourth = new Float64Array(width * height);
    this.latticeBetaX = new Float64Array(width * height);
    this.latticeBetaY = new Float64Array(width * height);
    for (const m of this.factors) this.lagrangeWeights(m);
  }

  /** Source-plane positions of the lattice rays (pixel centres) after the last evaluate(). */
  get latticeSourcePlane(): { readonly x: Float64Array; readonly y: Float64Array } {
    return { x: this.latticeBx, y: this.latticeBy };
  }

  /** Fills `means` for the profile vector p. */
  evaluate(p: Float64Array): void {
    this.raysTraced = 0;
    this.raysInterpolated = 0;
    this.directCount = 0;
    this.pixelsByLevel.fill(0);
    const count = this.pixels.length;
    let pendingCount: number;
    if (this.adaptive) {
      pendingCount = this.latticeLevel(p);
      if (this.hasSource) {
        this.checkInterpolation(p, this.pending, pendingCount);
        this.checkInterpolation(p, this.direct, this.directCount);
      }
    } else {
      for (let e = 0; e < count; e++) this.pending[e] = e;
      pendingCount = count;
    }
    for (let level = 0; level < this.factors.length && pendingCount + this.directCount > 0; level++) {
      const m = this.factors[level];
      if (m === this.supersampling) {
        for (let t = 0; t < this.directCount; t++) this.pending[pendingCount + t] = this.direct[t];
        pendingCount += this.directCount;
        this.directCount = 0;
      }
      this.subPixelMeans(p, m, pendingCount);
      pendingCount = this.refine(m, level, pendingCount);
    }
  }

  /**
   * Lattice rays and the stencil prediction; returns how many pixels are left pending. Each loop
   * over points sits in a method of its own with nothing after it: when V8 compiles a long loop
   * on first use (on-stack replacement), code after the loop that has not run yet becomes an
   * exit to the interpreter, and on Node 20 that code was seen to be re-entered and left on
   * every call (about 20% slower evaluations in some processes, none without OSR).
   */
  private latticeLevel(p: Float64Array): number {
    const n = this.latticeCount;
    this.trace(p, this.latticeX, this.latticeY, n, this.latticeAx, this.latticeAy, this.latticeBx, this.latticeBy);
    this.shine(p, this.latticeX, this.latticeY, this.latticeBx, this.latticeBy, n, this.latticeOut, n);
    this.raysTraced += n;
    this.scatterLatticeBeta();
    const count = this.pixels.length;
    this.flags.fill(0, 0, count);
    const planeSize = this.rowSecond.length;
    for (let k = 0; k < this.basisCount; k++) {
      const base = k * planeSize;
      this.scatterLatticeValues(k, base);
      this.writeConvolvedPeak(k, base);
      this.rowStencils(base);
      this.pixelStencils(k, base);
    }
    this.directCount = this.collectFlagged(2, this.allPixels, count, this.direct, this.directCount);
    const pendingCount = this.collectFlagged(1, this.allPixels, count, this.pending, 0);
    this.pixelsByLevel[0] = count - pendingCount - this.directCount;
    return pendingCount;
  }

  /** Source-plane positions of the lattice rays into the padded planes latticeBetaX, latticeBetaY. */
  private scatterLatticeBeta(): void {
    const padded = this.latticePadded;
    const betaX = this.latticeBetaX, betaY = this.latticeBetaY, bx = this.latticeBx, by = this.latticeBy;
    for (let e = 0; e < padded.length; e++) {
      betaX[padded[e]] = bx[e];
      betaY[padded[e]] = by[e];
    }
  }

  /** Lattice light of basis k into its padded plane of latticeValues (at `base`). */
  private scatterLatticeValues(k: number, base: number): void {
    const padded = this.latticePadded;
    const values = this.latticeValues, out = this.latticeOut;
    const from = k * padded.length;
    for (let e = 0; e < padded.length; e++) values[base + padded[e]] = out[from + e];
  }

  /** The stencils along x (3-point part and 5-point correction) at every row point (basis at `base`). */
  private rowStencils(base: number): void {
    const values = this.latticeValues;
    const rowSecond = this.rowSecond, rowFourth = this.rowFourth;
    const rowPoints = this.rowFilterPadded;
    const w30 = this.w3[1], w31 = this.w3[0];
    const d0 = this.d5[0], d1 = this.d5[1], d2 = this.d5[2];
    for (let e = 0; e < rowPoints.length; e++) {
      const r = rowPoints[e];
      const q = base + r;
      const centre = values[q];
      const near = values[q - 1] + values[q + 1];
      rowSecond[r] = w30 * centre + w31 * near;
      rowFourth[r] = d0 * centre + d1 * near + d2 * (values[q - 2] + values[q + 2]);
    }
  }

  /**
   * The stencils along y of basis k: the predicted mean into `means`, the centre value into
   * `previous`, and pixels whose error indicator exceeds the tolerance flagged in `flags`
   * (1: refine, 2: HOPELESS, straight to S x S).
   */
  private pixelStencils(k: number, base: number): void {
    const scale = this.scale[k];
    const values = this.latticeValues;
    const pixelsPadded = this.pixelsPadded;
    const count = pixelsPadded.length;
    const width = this.width;
    const w30 = this.w3[1], w31 = this.w3[0];
    const d0 = this.d5[0], d1 = this.d5[1], d2 = this.d5[2];
    const rowSecond = this.rowSecond, rowFourth = this.rowFourth;
    const means = this.means, previous = this.previous, flagged = this.flags;
    const relativeTolerance = this.relativeTolerance;
    const out = k * count;
    for (let e = 0; e < count; e++) {
      const q = pixelsPadded[e];
      const centre = values[base + q];
      const s0 = rowSecond[q], s1 = rowSecond[q - width] + rowSecond[q + width];
      const s2 = rowSecond[q - 2 * width] + rowSecond[q + 2 * width];
      const f0 = rowFourth[q], f1 = rowFourth[q - width] + rowFourth[q + width];
      const f2 = rowFourth[q - 2 * width] + rowFourth[q + 2 * width];
      const second = w30 * s0 + w31 * s1;
      const partX = w30 * f0 + w31 * f1;
      const partY = d0 * s0 + d1 * s1 + d2 * s2;
      const partXY = d0 * f0 + d1 * f1 + d2 * f2;
      means[out + e] = second + partX + partY + partXY;
      previous[out + e] = centre;
      const indicator = Math.max(
        Math.abs(partX) + Math.abs(partY) + Math.abs(partXY), LATTICE_GUARD * Math.abs(second - centre),
      );
      const tolerance = scale * relativeTolerance[e];
      if (indicator > HOPELESS * tolerance) flagged[e] = 2;
      else if (indicator > tolerance && flagged[e] === 0) flagged[e] = 1;
    }
  }

  /**
   * The pixels of list[0..listCount) flagged `flag` in `flags`, appended to `into` from index
   * `start` (in place when `into` is `list`); returns the new end of `into`.
   */
  private collectFlagged(flag: number, list: Int32Array, listCount: number, into: Int32Array, start: number): number {
    const flagged = this.flags;
    let end = start;
    for (let t = 0; t < listCount; t++) {
      const e = list[t];
      if (flagged[e] === flag) into[end++] = e;
    }
    return end;
  }

  /**
   * scale[k]: |PSF-convolved lattice values| at the listed pixel of largest |lattice value| (basis
   * at `base`). Written, not returned: a double returned from a call V8 does not inline is boxed,
   * one allocation per evaluation.
   */
  private writeConvolvedPeak(k: number, base: number): void {
    const brightest = this.brightestPixel(base);
    if (brightest < 0) {
      this.scale[k] = 0;
      return;
    }
    const values = this.latticeValues;
    const { columns, rows, values: weights } = this.kernel;
    const width = this.width;
    const i = (brightest % width) - 2;
    const j = Math.floor(brightest / width) - 2;
    const halfX = (columns - 1) / 2, halfY = (rows - 1) / 2;
    let sum = 0;
    for (let b = 0; b < rows; b++) {
      const jj = j - (b - halfY);
      if (jj < -2 || jj >= this.grid.rows + 2) continue;
      for (let a = 0; a < columns; a++) {
        const ii = i - (a - halfX);
        if (ii < -2 || ii >= this.grid.columns + 2) continue;
        sum += weights[b * columns + a] * values[base + (jj + 2) * width + ii + 2];
      }
    }
    this.scale[k] = Math.abs(sum);
  }

  /** Padded index of the listed pixel of largest |lattice value| (basis at `base`), -1 if none. */
  private brightestPixel(base: number): number {
    const values = this.latticeValues;
    const padded = this.pixelsPadded;
    let brightest = -1;
    let peak = -1;
    for (let e = 0; e < padded.length; e++) {
      const value = Math.abs(values[base + padded[e]]);
      if (value > peak) {
        peak = value;
        brightest = padded[e];
      }
    }
    return brightest;
  }

  /**
   * m x m sub-pixel means of the pending pixels into `current`: rays of the pixels marked
   * `interpolable` (checkInterpolation) are not traced, their source-plane positions come from
   * the lattice (interpolatedBeta).
   */
  private subPixelMeans(p: Float64Array, m: number, pendingCount: number): void {
    if (!this.hasSource || !this.adaptive) {
      this.subPixelPass(p, m, 0, pendingCount, false);
      return;
    }
    // Traced pixels first, then interpolated ones (pending is reordered, which refine() allows).
    const pending = this.pending;
    const interpolable = this.interpolable;
    let traced = 0;
    for (let t = 0; t < pendingCount; t++) {
      const e = pending[t];
      if (interpolable[e] === 0) {
        pending[t] = pending[traced];
        pending[traced++] = e;
      }
    }
    if (traced > 0) this.subPixelPass(p, m, 0, traced, false);
    if (traced < pendingCount) this.subPixelPass(p, m, traced, pendingCount, true);
  }

  /**
   * One pass of subPixelMeans over pending[from..to), in chunks of rays (each loop over rays in
   * a method of its own; see latticeLevel).
   */
  private subPixelPass(p: Float64Array, m: number, from: number, to: number, interpolate: boolean): void {
    const perChunk = Math.floor(CHUNK / (m * m));
    const weights = this.lagrangeWeights(m);
    for (let start = from; start < to; start += perChunk) {
      const end = Math.min(to, start + perChunk);
      const r = this.fillChunk(m, weights, start, end, interpolate);
      if (!interpolate) {
        this.trace(p, this.chunkX, this.chunkY, r, this.chunkAx, this.chunkAy, this.chunkBx, this.chunkBy);
        this.raysTraced += r;
      } else {
        this.raysInterpolated += r;
      }
      this.shine(p, this.chunkX, this.chunkY, this.chunkBx, this.chunkBy, r, this.chunkOut, CHUNK);
      for (let k = 0; k < this.basisCount; k++) this.storeChunkMeans(k, m * m, end - start);
    }
  }

  /** Rays of the m x m sub-pixels of pending[start..end) into the chunk; returns their number. */
  private fillChunk(m: number, weights: Float64Array, start: number, end: number, interpolate: boolean): number {
    const run = m * m;
    let r = 0;
    for (let t = start; t < end; t++) {
      const e = this.pending[t];
      this.chunkPixels[t - start] = e;
      if (!interpolate || this.hasImagePlane) this.subPixelPositions(e, m, r);
      if (interpolate) this.interpolatedBeta(e, m, weights, this.chunkBx, this.chunkBy, r);
      r += run;
    }
    return r;
  }

  /** Means over runs of `run` rays of basis k in the chunk into `current`, for `pixels` pixels. */
  private storeChunkMeans(k: number, run: number, pixels: number): void {
    const out = this.chunkOut, current = this.current, chunkPixels = this.chunkPixels;
    const inverseRun = 1 / run;
    const into = k * this.pixels.length;
    let index = k * CHUNK;
    for (let t = 0; t < pixels; t++) {
      let sum = 0;
      for (let u = 0; u < run; u++) sum += out[index + u];
      current[into + chunkPixels[t]] = sum * inverseRun;
      index += run;
    }
  }

  /**
   * Marks the listed pixels whose sub-pixel rays may be interpolated from the lattice: the
   * traced position at the pixel centre is predicted from its four lattice neighbours along x,
   * and along y, by cubic Lagrange interpolation (nodes -2, -1, 1, 2: weights -1/6, 2/3, 2/3,
   * -1/6), and the light at both predictions must differ from the light of the traced centre by
   * at most INTERPOLATION_GUARD (5) times the tolerance. The error of that prediction,
   * h^4 b^(4) / 6, exceeds the error of the degree-4 interpolation used for the sub-pixels,
   * |w(t)| h^5 b^(5) / 120 with |w(t)| <= 1.41 for |t| <= 1/2 (Abramowitz & Stegun 1964,
   * 25.2.3), roughly 14 r / (5 h)-fold for deflections whose k-th derivatives scale as k!/r^k
   * (r the distance to the nearest mass centre): at least 20-fold for r >= 0.35 arcsec and
   * h = 0.05 arcsec, so 5 tolerances at the prediction mean at most a quarter of one at the
   * sub-pixels. The check fails near the centre of a cuspy perturber, where interpolation would.
   * (In test/forward/forwardAccuracy.test.ts the errors are the same to three digits as with
   * every ray traced.)
   */
  private checkInterpolation(p: Float64Array, list: Int32Array, listCount: number): void {
    const perChunk = CHUNK / 2;
    for (let start = 0; start < listCount; start += perChunk) {
      const end = Math.min(listCount, start + perChunk);
      const r = this.predictCentres(list, start, end);
      this.shine(p, this.chunkX, this.chunkY, this.chunkBx, this.chunkBy, r, this.chunkOut, CHUNK);
      this.markInterpolable(list, start, end);
    }
  }

  /**
   * For list[start..end): the pixel centre twice in the chunk with the source-plane position
   * predicted along x, then along y (see checkInterpolation); returns the number of rays.
   */
  private predictCentres(list: Int32Array, start: number, end: number): number {
    const { columns, rows, pixelScaleArcsec: scale } = this.grid;
    const width = this.width;
    const betaX = this.latticeBetaX, betaY = this.latticeBetaY;
    const x = this.chunkX, y = this.chunkY, bx = this.chunkBx, by = this.chunkBy;
    let r = 0;
    for (let t = start; t < end; t++) {
      const e = list[t];
      const q = this.pixelsPadded[e];
      const pixel = this.pixels[e];
      const i = pixel % columns;
      x[r] = x[r + 1] = (i - (columns - 1) / 2) * scale;
      y[r] = y[r + 1] = ((pixel - i) / columns - (rows - 1) / 2) * scale;
      bx[r] = (4 * (betaX[q - 1] + betaX[q + 1]) - (betaX[q - 2] + betaX[q + 2])) / 6;
      by[r] = (4 * (betaY[q - 1] + betaY[q + 1]) - (betaY[q - 2] + betaY[q + 2])) / 6;
      bx[r + 1] = (4 * (betaX[q - width] + betaX[q + width]) - (betaX[q - 2 * width] + betaX[q + 2 * width])) / 6;
      by[r + 1] = (4 * (betaY[q - width] + betaY[q + width]) - (betaY[q - 2 * width] + betaY[q + 2 * width])) / 6;
      r += 2;
    }
    return r;
  }

  /** interpolable[e] for list[start..end) from the light at the predicted centres in the chunk. */
  private markInterpolable(list: Int32Array, start: number, end: number): void {
    const values = this.latticeValues;
    const planeSize = this.rowSecond.length;
    const out = this.chunkOut;
    for (let t = start, u = 0; t < end; t++, u += 2) {
      const e = list[t];
      const q = this.pixelsPadded[e];
      let ok = true;
      for (let k = 0; k < this.basisCount; k++) {
        const centre = values[k * planeSize + q];
        const worst = Math.max(Math.abs(out[k * CHUNK + u] - centre), Math.abs(out[k * CHUNK + u + 1] - centre));
        if (worst > INTERPOLATION_GUARD * this.scale[k] * this.relativeTolerance[e]) ok = false;
      }
      this.interpolable[e] = ok ? 1 : 0;
    }
  }

  /** Image-plane positions of the m x m sub-pixels of pixels[e] at chunk index r on. */
  private subPixelPositions(e: number, m: number, r: number): void {
    const { columns, rows, pixelScaleArcsec: scale } = this.grid;
    const step = scale / m;
    const pixel = this.pixels[e];
    const i = pixel % columns;
    const j = (pixel - i) / columns;
    const x0 = (i - (columns - 1) / 2) * scale + (0.5 / m - 0.5) * scale;
    const y0 = (j - (rows - 1) / 2) * scale + (0.5 / m - 0.5) * scale;
    const x = this.chunkX, y = this.chunkY;
    for (let b = 0; b < m; b++) {
      const yb = y0 + b * step;
      for (let a = 0; a < m; a++) {
        x[r] = x0 + a * step;
        y[r] = yb;
        r++;
      }
    }
  }

  /**
   * Source-plane positions of the m x m sub-pixels of pixels[e] by tensor-product Lagrange
   * interpolation of degree 4 (Abramowitz & Stegun 1964, 25.2.2) of the traced lattice positions
   * over the pixel's 5 x 5 neighbourhood, into bx, by from index r on. The sub-pixel offsets come
   * in pairs +-t and the weights satisfy w_k(-t) = w_-k(t), so each 1-D interpolation is split
   * into the part even in t, from f_0 and the sums f_k + f_-k, and the odd part, from the
   * differences f_k - f_-k (see lagrangeWeights): one pair of offsets for about the work of one.
   */
  private interpolatedBeta(e: number, m: number, weights: Float64Array, bx: Float64Array, by: Float64Array, r: number): void {
    const width = this.width;
    const q = this.pixelsPadded[e];
    const rowX = this.rowX, rowY = this.rowY;
    const betaX = this.latticeBetaX, betaY = this.latticeBetaY;
    const pairs = (m + 1) >> 1;
    // Along x for the five lattice rows: rowX[b * m + a] at sub-column a.
    for (let b = 0, row = 0; b < 5; b++, row += m) {
      const c = q + (b - 2) * width;
      const x0 = betaX[c], x1 = betaX[c + 1] + betaX[c - 1], x2 = betaX[c + 2] + betaX[c - 2];
      const u1 = betaX[c + 1] - betaX[c - 1], u2 = betaX[c + 2] - betaX[c - 2];
      const y0 = betaY[c], y1 = betaY[c + 1] + betaY[c - 1], y2 = betaY[c + 2] + betaY[c - 2];
      const v1 = betaY[c + 1] - betaY[c - 1], v2 = betaY[c + 2] - betaY[c - 2];
      for (let h = 0, w = 0; h < pairs; h++, w += 5) {
        const w0 = weights[w], w1 = weights[w + 1], w2 = weights[w + 2], w3 = weights[w + 3], w4 = weights[w + 4];
        const evenX = w0 * x0 + w1 * x1 + w2 * x2, oddX = w3 * u1 + w4 * u2;
        const evenY = w0 * y0 + w1 * y1 + w2 * y2, oddY = w3 * v1 + w4 * v2;
        rowX[row + h] = evenX - oddX;
        rowY[row + h] = evenY - oddY;
        rowX[row + m - 1 - h] = evenX + oddX;
        rowY[row + m - 1 - h] = evenY + oddY;
      }
    }
    // Along y: column a of the m x m block from the five row values of that column.
    const last = r + (m - 1) * m;
    for (let a = 0; a < m; a++) {
      const x0 = rowX[2 * m + a], x1 = rowX[3 * m + a] + rowX[m + a], x2 = rowX[4 * m + a] + rowX[a];
      const u1 = rowX[3 * m + a] - rowX[m + a], u2 = rowX[4 * m + a] - rowX[a];
      const y0 = rowY[2 * m + a], y1 = rowY[3 * m + a] + rowY[m + a], y2 = rowY[4 * m + a] + rowY[a];
      const v1 = rowY[3 * m + a] - rowY[m + a], v2 = rowY[4 * m + a] - rowY[a];
      for (let h = 0, w = 0, low = r + a, high = last + a; h < pairs; h++, w += 5, low += m, high -= m) {
        const w0 = weights[w], w1 = weights[w + 1], w2 = weights[w + 2], w3 = weights[w + 3], w4 = weights[w + 4];
        const evenX = w0 * x0 + w1 * x1 + w2 * x2, oddX = w3 * u1 + w4 * u2;
        const evenY = w0 * y0 + w1 * y1 + w2 * y2, oddY = w3 * v1 + w4 * v2;
        bx[low] = evenX - oddX;
        by[low] = evenY - oddY;
        bx[high] = evenX + oddX;
        by[high] = evenY + oddY;
      }
    }
  }

  /**
   * Lagrange weights w_k(t) on the nodes k = -2..2 (Abramowitz & Stegun 1964, 25.2.2) at the
   * sub-pixel offsets t = (a + 1/2)/m - 1/2 >= 0, a = m - 1 - h for h = 0..ceil(m/2) - 1, as five
   * numbers per offset: w_0, (w_1 + w_-1)/2, (w_2 + w_-2)/2, (w_1 - w_-1)/2, (w_2 - w_-2)/2, the
   * weights of f_0, f_1 + f_-1, f_2 + f_-2 (even part) and f_1 - f_-1, f_2 - f_-2 (odd part). At
   * -t the even part is the same and the odd part changes sign.
   */
  private lagrangeWeights(m: number): Float64Array {
    const cached = this.weightsByFactor.get(m);
    if (cached !== undefined) return cached;
    const pairs = (m + 1) >> 1;
    const weights = new Float64Array(5 * pairs);
    const w = new Float64Array(5);
    for (let h = 0; h < pairs; h++) {
      const t = (m - 1 - h + 0.5) / m - 0.5;
      for (let k = -2; k <= 2; k++) {
        let product = 1;
        for (let j = -2; j <= 2; j++) if (j !== k) product *= (t - j) / (k - j);
        w[k + 2] = product;
      }
      weights.set([w[2], (w[3] + w[1]) / 2, (w[4] + w[0]) / 2, (w[3] - w[1]) / 2, (w[4] - w[0]) / 2], 5 * h);
    }
    this.weightsByFactor.set(m, weights);
    return weights;
  }

  /** Accepts or keeps pending the pixels after factor m; returns how many stay pending. */
  private refine(m: number, level: number, pendingCount: number): number {
    if (m === this.supersampling) {
      this.acceptExact(pendingCount);
      this.pixelsByLevel[level + 1] = pendingCount;
      return 0;
    }
    this.extrapolate(level, pendingCount);
    const directBefore = this.directCount;
    this.directCount = this.collectFlagged(2, this.pending, pendingCount, this.direct, directBefore);
    const kept = this.collectFlagged(1, this.pending, pendingCount, this.pending, 0);
    this.pixelsByLevel[level + 1] = pendingCount - kept - (this.directCount - directBefore);
    return kept;
  }

  /** The S x S means of the pending pixels are the model's values. */
  private acceptExact(pendingCount: number): void {
    const count = this.pixels.length;
    const means = this.means, current = this.current, pending = this.pending;
    for (let t = 0; t < pendingCount; t++) {
      const e = pending[t];
      for (let k = 0; k < this.basisCount; k++) means[k * count + e] = current[k * count + e];
    }
  }

  /**
   * Richardson extrapolation (the factor of `level`) of the pending pixels into `means`; each is
   * flagged in `flags`: 0 done, 1 still above the tolerance, 2 above HOPELESS tolerances.
   */
  private extrapolate(level: number, pendingCount: number): void {
    const factor = this.richardsonByLevel[level];
    const convergence = level === 0 ? 1 : 1 / EXTRAPOLATED_CONVERGENCE;
    const count = this.pixels.length;
    const means = this.means, previous = this.previous, current = this.current;
    const pending = this.pending, flagged = this.flags;
    const scale = this.scale, relativeTolerance = this.relativeTolerance;
    for (let t = 0; t < pendingCount; t++) {
      const e = pending[t];
      let refineFurther = false;
      let hopeless = false;
      for (let k = 0; k < this.basisCount; k++) {
        const index = k * count + e;
        const now = current[index];
        const step = (now - previous[index]) * factor;
        const predicted = now + step;
        const indicator = Math.max(convergence * Math.abs(predicted - means[index]), RICHARDSON_GUARD * Math.abs(step));
        const tolerance = scale[k] * relativeTolerance[e];
        if (indicator > tolerance) refineFurther = true;
        if (indicator > HOPELESS * tolerance) hopeless = true;
        means[index] = predicted;
        previous[index] = now;
      }
      flagged[e] = hopeless ? 2 : refineFurther ? 1 : 0;
    }
  }

  /** Deflection and source-plane positions b = x - alpha(x) of n rays (skipped without source light). */
  private trace(
    p: Float64Array, x: Float64Array, y: Float64Array, n: number,
    ax: Float64Array, ay: Float64Array, bx: Float64Array, by: Float64Array,
  ): void {
    if (this.hasSource) traceRays(this.massTerms, p, x, y, n, ax, ay, bx, by);
  }

  /** Unit-amplitude light of every basis at n rays into out[k * stride + i]. */
  private shine(
    p: Float64Array, x: Float64Array, y: Float64Array, bx: Float64Array, by: Float64Array, n: number,
    out: Float64Array, stride: number,
  ): void {
    const lightTerms = this.lightTerms;
    for (let t = 0; t < lightTerms.length; t++) {
      const term = lightTerms[t];
      const px = term.imagePlane ? x : bx;
      const py = term.imagePlane ? y : by;
      term.profile.writeBasis(p, term.offset, px, py, n, out, term.firstBasis * stride, stride);
    }
  }
}
