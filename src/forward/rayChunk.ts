import type { LightProfile } from '../light/lightProfile.js';

/** Rays are traced in batches of at most this many (a multiple of every S^2 up to S = 64). */
export const CHUNK = 4096;
/** A chunk's light holds at most about this many bytes, so it stays in cache between writing and averaging. */
const LIGHT_BYTES = 256 * 1024;

/**
 * Rays per chunk for `basisCount` bases and supersampling S: CHUNK, halved while the light would
 * exceed LIGHT_BYTES (many-basis sources such as shapelets), but never below S^2 (one pixel's
 * rays). A power of two, so a multiple of every S^2 of a power-of-two S up to it.
 */
export function chunkSize(basisCount: number, supersampling: number): number {
  let size = CHUNK;
  while (size > supersampling * supersampling && size % 2 === 0 && 8 * Math.max(1, basisCount) * size > LIGHT_BYTES) size /= 2;
  return size;
}

/** A light component as the pixel-mean evaluator sees it. */
export interface MeanLightTerm {
  readonly profile: LightProfile;
  readonly offset: number;
  /** Index of the component's first basis image among the evaluator's bases. */
  readonly firstBasis: number;
  /** True for lens light (evaluated at image-plane positions), false for source light. */
  readonly imagePlane: boolean;
}

/** One batch of rays: image-plane positions, deflections, source-plane positions, light, and the pixel of each run. */
export class RayChunk {
  /** Rays per chunk (chunkSize). */
  readonly size: number;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly ax: Float64Array;
  readonly ay: Float64Array;
  readonly bx: Float64Array;
  readonly by: Float64Array;
  /** Light of basis k at ray i: out[k * size + i]. */
  readonly out: Float64Array;
  /** The pixel (index into the listed pixels) of each run of rays. */
  readonly pixels: Int32Array;

  constructor(basisCount: number, supersampling: number) {
    const size = chunkSize(basisCount, supersampling);
    this.size = size;
    this.x = new Float64Array(size);
    this.y = new Float64Array(size);
    this.ax = new Float64Array(size);
    this.ay = new Float64Array(size);
    this.bx = new Float64Array(size);
    this.by = new Float64Array(size);
    this.pixels = new Int32Array(size);
    this.out = new Float64Array(Math.max(1, basisCount) * size);
  }

  /** Means over runs of `run` rays of basis k into current[k * count + pixel], for `pixels` runs. */
  storeMeans(k: number, run: number, pixels: number, current: Float64Array, count: number): void {
    const out = this.out, chunkPixels = this.pixels;
    const inverseRun = 1 / run;
    const into = k * count;
    let index = k * this.size;
    for (let t = 0; t < pixels; t++) {
      let sum = 0;
      for (let u = 0; u < run; u++) sum += out[index + u];
      current[into + chunkPixels[t]] = sum * inverseRun;
      index += run;
    }
  }
}

/** Unit-amplitude light of every basis of the terms at n rays into out[k * stride + i]. */
export function shine(
  lightTerms: readonly MeanLightTerm[], p: Float64Array, x: Float64Array, y: Float64Array, bx: Float64Array, by: Float64Array,
  n: number, out: Float64Array, stride: number,
): void {
  for (let t = 0; t < lightTerms.length; t++) {
    const term = lightTerms[t];
    const px = term.imagePlane ? x : bx;
    const py = term.imagePlane ? y : by;
    term.profile.writeBasis(p, term.offset, px, py, n, out, term.firstBasis * stride, stride);
  }
}

/**
 * The means over runs of `run` rays of every basis of the terms into current[k * count + pixel]
 * (the chunk's pixels), for `runs` runs: a term that averages its own runs (writeRunMeans) does so
 * straight from the rays; the others write their light into the chunk, averaged by storeMeans.
 */
export function shineMeans(
  lightTerms: readonly MeanLightTerm[], p: Float64Array, chunk: RayChunk, runs: number, run: number,
  current: Float64Array, count: number,
): void {
  const n = runs * run;
  for (let t = 0; t < lightTerms.length; t++) {
    const term = lightTerms[t];
    const px = term.imagePlane ? chunk.x : chunk.bx;
    const py = term.imagePlane ? chunk.y : chunk.by;
    const profile = term.profile;
    if (profile.writeRunMeans !== undefined) {
      profile.writeRunMeans(p, term.offset, px, py, runs, run, chunk.pixels, current, term.firstBasis * count, count);
      continue;
    }
    profile.writeBasis(p, term.offset, px, py, n, chunk.out, term.firstBasis * chunk.size, chunk.size);
    for (let k = term.firstBasis; k < term.firstBasis + profile.basisCount; k++) chunk.storeMeans(k, run, runs, current, count);
  }
}
