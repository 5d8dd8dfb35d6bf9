/** A pixel's state after a level of the adaptive pixel means. */
export const DONE = 0;
/** Still above its tolerance: refine with the next sub-pixel factor. */
export const REFINE = 1;
/** More than HOPELESS tolerances off: straight to the S x S rays. */
export const STRAIGHT_TO_FULL = 2;

/**
 * A pixel whose indicator exceeds this many tolerances goes straight to the S x S rays: the next
 * factor cuts the midpoint error about fourfold (m^-2), sixteenfold after extrapolation for
 * smooth light, so it would fail again (in the demo and compact-source scenarios every pixel
 * above 30 tolerances at one level needed S x S). This changes the cost only: S x S is exact.
 */
export const HOPELESS = 30;

/** Buffers of a PixelMeanState made by its owner (the sizes of the state's own arrays). */
export interface PixelMeanViews {
  readonly means: Float64Array;
  readonly previous: Float64Array;
  readonly current: Float64Array;
  readonly pending: Int32Array;
  readonly flags: Int32Array;
  readonly scale: Float64Array;
  readonly relativeTolerance: Float64Array;
}

/**
 * The buffers the parts of AdaptivePixelMeans share, for basisCount bases of `count` pixels
 * (basis k of pixel e at index k * count + e).
 */
export class PixelMeanState {
  readonly count: number;
  readonly basisCount: number;
  /** The current estimate of each mean (the result once a pixel is done). */
  readonly means: Float64Array;
  /** The mean at the previous and at the current sub-pixel factor (the lattice centre value first). */
  readonly previous: Float64Array;
  readonly current: Float64Array;
  /** Per pixel after a level: DONE, REFINE or STRAIGHT_TO_FULL. */
  readonly flags: Int32Array;
  /** Pixels still pending, and those sent straight to the S x S rays (directCount of them). */
  readonly pending: Int32Array;
  readonly direct: Int32Array;
  directCount = 0;
  /** Scale of each basis: its PSF-convolved lattice image at the brightest listed pixel. */
  readonly scale: Float64Array;
  /** Relative tolerance of each pixel (see ForwardModelOptions). */
  readonly relativeTolerance: Float64Array;

  /**
   * `held`: means, previous, current, pending, flags, scale and relativeTolerance as views made elsewhere (the
   * stencil kernel's memory, stencilKernel.ts); relativeTolerance is then copied into its view.
   */
  constructor(count: number, basisCount: number, relativeTolerance: Float64Array, held?: PixelMeanViews) {
    this.count = count;
    this.basisCount = basisCount;
    this.means = held?.means ?? new Float64Array(basisCount * count);
    this.previous = held?.previous ?? new Float64Array(basisCount * count);
    this.current = held?.current ?? new Float64Array(basisCount * count);
    this.flags = held?.flags ?? new Int32Array(count);
    this.pending = held?.pending ?? new Int32Array(count);
    this.direct = new Int32Array(count);
    this.scale = held?.scale ?? new Float64Array(basisCount);
    this.relativeTolerance = held === undefined ? relativeTolerance : held.relativeTolerance;
    if (held !== undefined) held.relativeTolerance.set(relativeTolerance);
  }

  /**
   * The pixels of list[0..listCount) flagged `flag`, appended to `into` from index `start` (in
   * place when `into` is `list`); returns the new end of `into`.
   */
  collectFlagged(flag: number, list: Int32Array, listCount: number, into: Int32Array, start: number): number {
    const flagged = this.flags;
    let end = start;
    for (let t = 0; t < listCount; t++) {
      const e = list[t];
      if (flagged[e] === flag) into[end++] = e;
    }
    return end;
  }
}
