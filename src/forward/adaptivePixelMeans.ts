import type { PixelGrid } from '../imaging/pixelGrid.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import { traceRays } from '../lensing/lensEquation.js';
import type { MassTerm } from '../lensing/massTerm.js';
import { BasisScale } from './basisScale.js';
import { LatticeStencil } from './latticeStencil.js';
import { PixelLattice } from './pixelLattice.js';
import { PixelMeanState, REFINE, STRAIGHT_TO_FULL } from './pixelMeanState.js';
import { CHUNK, RayChunk, shine, shineMeans, type MeanLightTerm } from './rayChunk.js';
import { RichardsonRefinement } from './richardsonRefinement.js';
import { StencilMemory, stencilModule } from './stencilKernel.js';
import { SubPixelInterpolation } from './subPixelInterpolation.js';

export { EXTRAPOLATED_CONVERGENCE } from './richardsonRefinement.js';
export type { MeanLightTerm } from './rayChunk.js';

/**
 * Where the lattice stencils run: 'auto' in WebAssembly (stencilKernel.ts) where the engine has
 * it, 'javaScript' the twin it is tested against. Both give the same bits.
 */
export type StencilEngine = 'auto' | 'javaScript';

/**
 * Mean surface brightness over S x S sub-pixels (S = `supersampling`, the midpoint rule that
 * defines the model's pixel values) of each basis image at a fixed list of pixels, computed
 * adaptively so that most pixels need one ray instead of S^2:
 * 1. one ray through every pixel centre of the listed pixels and of a two-pixel ring around them
 *    (PixelLattice); a stencil over each pixel's 5 x 5 neighbourhood predicts its S x S mean and
 *    estimates the error (LatticeStencil);
 * 2. pixels above their tolerance get m x m sub-pixel rays, m = 2, 4, ... below S, with Richardson
 *    extrapolation towards S (RichardsonRefinement);
 * 3. pixels still above it get the S x S rays themselves: the exact model value.
 * Sub-pixel rays are traced only for pixels where interpolating their source-plane positions
 * from the lattice is not safe (SubPixelInterpolation). The tolerance of basis k at pixel e is
 * relativeTolerance[e] times the basis's scale (BasisScale). The indicators are estimates of the
 * error, not bounds: test/forward/forwardAccuracy.test.ts compares the result with the
 * brute-force S x S model. With `uniform` every pixel gets the S x S rays.
 * Buffers are allocated here; evaluate() creates no arrays or objects. Each loop over points sits
 * in a method of its own with nothing after it: when V8 compiles a long loop on first use
 * (on-stack replacement), code after the loop that has not run yet becomes an exit to the
 * interpreter, and on Node 20 that exit was seen to be taken on every later call.
 */
export class AdaptivePixelMeans {
  readonly pixels: Int32Array;
  readonly basisCount: number;
  /** Per-pixel means after evaluate(): basis k of pixels[e] at means[k * pixels.length + e]. */
  readonly means: Float64Array;
  /** Sub-pixel factors after the lattice, ending with S. */
  readonly factors: Int32Array;
  /** Pixels finished at the lattice (index 0) and at each factor (index l + 1), last evaluate. */
  readonly pixelsByLevel: Int32Array;
  /** Scale of each basis (see BasisScale) after the last evaluate(). */
  readonly scale: Float64Array;
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
  private readonly state: PixelMeanState;
  private readonly lattice: PixelLattice;
  private readonly stencil: LatticeStencil;
  private readonly basisScale: BasisScale;
  private readonly refinement: RichardsonRefinement;
  private readonly interpolation: SubPixelInterpolation;
  private readonly chunk: RayChunk;
  /** 0, 1, ..., pixels.length - 1. */
  private readonly allPixels: Int32Array;

  constructor(
    grid: PixelGrid, supersampling: number, pixels: Int32Array, massTerms: readonly MassTerm[],
    lightTerms: readonly MeanLightTerm[], basisCount: number, relativeTolerance: Float64Array, kernel: PsfKernel,
    uniform: boolean, engine: StencilEngine = 'auto',
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
    this.adaptive = !uniform && supersampling > 1;
    const count = this.pixels.length;
    const memory = this.adaptive && engine === 'auto' && stencilModule !== null
      ? new StencilMemory(count, basisCount, PixelLattice.planeSizeOf(grid)) : undefined;
    this.state = new PixelMeanState(count, basisCount, relativeTolerance, memory);
    this.means = this.state.means;
    this.scale = this.state.scale;
    this.allPixels = Int32Array.from({ length: count }, (_, e) => e);
    this.lattice = new PixelLattice(grid, this.pixels, basisCount, this.adaptive, memory);
    this.stencil = new LatticeStencil(this.lattice, this.state, supersampling, memory);
    this.basisScale = new BasisScale(this.lattice, grid, kernel, this.state.scale);
    this.refinement = new RichardsonRefinement(this.state, supersampling, this.adaptive, memory);
    this.factors = this.refinement.factors;
    this.pixelsByLevel = this.refinement.pixelsByLevel;
    this.chunk = new RayChunk(basisCount, supersampling);
    this.interpolation = new SubPixelInterpolation(this.lattice, this.state, grid, this.pixels, this.chunk, lightTerms, this.factors);
  }

  /** Source-plane positions of the lattice rays (pixel centres) after the last evaluate(). */
  get latticeSourcePlane(): { readonly x: Float64Array; readonly y: Float64Array } {
    return { x: this.lattice.bx, y: this.lattice.by };
  }

  /** Fills `means` for the profile vector p. */
  evaluate(p: Float64Array): void {
    const state = this.state;
    this.raysTraced = 0;
    this.raysInterpolated = 0;
    state.directCount = 0;
    this.pixelsByLevel.fill(0);
    const count = this.pixels.length;
    let pendingCount: number;
    if (this.adaptive) {
      pendingCount = this.latticeLevel(p);
      if (this.hasSource) {
        this.interpolation.check(p, state.pending, pendingCount);
        this.interpolation.check(p, state.direct, state.directCount);
      }
    } else {
      for (let e = 0; e < count; e++) state.pending[e] = e;
      pendingCount = count;
    }
    for (let level = 0; level < this.factors.length && pendingCount + state.directCount > 0; level++) {
      const m = this.factors[level];
      if (m === this.supersampling) {
        for (let t = 0; t < state.directCount; t++) state.pending[pendingCount + t] = state.direct[t];
        pendingCount += state.directCount;
        state.directCount = 0;
      }
      this.subPixelMeans(p, m, pendingCount);
      pendingCount = this.refinement.refine(m, level, pendingCount);
    }
  }

  /** Lattice rays and the stencil prediction; returns how many pixels are left pending. */
  private latticeLevel(p: Float64Array): number {
    const lattice = this.lattice;
    const state = this.state;
    const n = lattice.count;
    this.trace(p, lattice.x, lattice.y, n, lattice.ax, lattice.ay, lattice.bx, lattice.by);
    shine(this.lightTerms, p, lattice.x, lattice.y, lattice.bx, lattice.by, n, lattice.out, n);
    this.raysTraced += n;
    lattice.scatterBeta();
    const count = this.pixels.length;
    state.flags.fill(0, 0, count);
    // Last basis first: see LatticeStencil.pixelStencils.
    let live = this.stencil.startBases();
    for (let k = this.basisCount - 1; k >= 0; k--) {
      const base = k * lattice.planeSize;
      this.stencil.plane(k, base);
      this.basisScale.write(k, base);
      live = this.stencil.pixelStencils(k, base, live);
    }
    state.directCount = state.collectFlagged(STRAIGHT_TO_FULL, this.allPixels, count, state.direct, state.directCount);
    const pendingCount = state.collectFlagged(REFINE, this.allPixels, count, state.pending, 0);
    this.pixelsByLevel[0] = count - pendingCount - state.directCount;
    return pendingCount;
  }

  /**
   * m x m sub-pixel means of the pending pixels into `current` (`means` at m = S): rays of the
   * pixels marked interpolable are not traced, their source-plane positions come from the lattice.
   */
  private subPixelMeans(p: Float64Array, m: number, pendingCount: number): void {
    if (!this.hasSource || !this.adaptive) {
      this.subPixelPass(p, m, 0, pendingCount, false);
      return;
    }
    // Traced pixels first, then interpolated ones (pending is reordered, which refine() allows).
    const pending = this.state.pending;
    const interpolable = this.interpolation.interpolable;
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
   * One pass of subPixelMeans over pending[from..to), in chunks of rays; the S x S means are the
   * model's values and go straight into `means`.
   */
  private subPixelPass(p: Float64Array, m: number, from: number, to: number, interpolate: boolean): void {
    const perChunk = Math.floor(this.chunk.size / (m * m));
    const weights = this.interpolation.lagrangeWeights(m);
    const chunk = this.chunk;
    const into = m === this.supersampling ? this.state.means : this.state.current;
    for (let start = from; start < to; start += perChunk) {
      const end = Math.min(to, start + perChunk);
      const r = this.fillChunk(m, weights, start, end, interpolate);
      if (!interpolate) {
        this.trace(p, chunk.x, chunk.y, r, chunk.ax, chunk.ay, chunk.bx, chunk.by);
        this.raysTraced += r;
      } else {
        this.raysInterpolated += r;
      }
      shineMeans(this.lightTerms, p, chunk, end - start, m * m, into, this.pixels.length);
    }
  }

  /** Rays of the m x m sub-pixels of pending[start..end) into the chunk; returns their number. */
  private fillChunk(m: number, weights: Float64Array, start: number, end: number, interpolate: boolean): number {
    const run = m * m;
    const pending = this.state.pending;
    const chunk = this.chunk;
    let r = 0;
    for (let t = start; t < end; t++) {
      const e = pending[t];
      chunk.pixels[t - start] = e;
      if (!interpolate || this.hasImagePlane) this.subPixelPositions(e, m, r);
      if (interpolate) this.interpolation.interpolatedBeta(e, m, weights, chunk.bx, chunk.by, r);
      r += run;
    }
    return r;
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
    const x = this.chunk.x, y = this.chunk.y;
    for (let b = 0; b < m; b++) {
      const yb = y0 + b * step;
      for (let a = 0; a < m; a++) {
        x[r] = x0 + a * step;
        y[r] = yb;
        r++;
      }
    }
  }

  /** Deflection and source-plane positions of n rays by the lens equation (skipped without source light). */
  private trace(
    p: Float64Array, x: Float64Array, y: Float64Array, n: number,
    ax: Float64Array, ay: Float64Array, bx: Float64Array, by: Float64Array,
  ): void {
    if (this.hasSource) traceRays(this.massTerms, p, x, y, n, ax, ay, bx, by);
  }
}
