import type { LightProfile } from '../light/lightProfile.js';

/** Rays are traced in batches of this many (a multiple of every S^2 up to S = 64). */
export const CHUNK = 4096;

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
  readonly x = new Float64Array(CHUNK);
  readonly y = new Float64Array(CHUNK);
  readonly ax = new Float64Array(CHUNK);
  readonly ay = new Float64Array(CHUNK);
  readonly bx = new Float64Array(CHUNK);
  readonly by = new Float64Array(CHUNK);
  /** Light of basis k at ray i: out[k * CHUNK + i]. */
  readonly out: Float64Array;
  /** The pixel (index into the listed pixels) of each run of rays. */
  readonly pixels = new Int32Array(CHUNK);

  constructor(basisCount: number) {
    this.out = new Float64Array(Math.max(1, basisCount) * CHUNK);
  }

  /** Means over runs of `run` rays of basis k into current[k * count + pixel], for `pixels` runs. */
  storeMeans(k: number, run: number, pixels: number, current: Float64Array, count: number): void {
    const out = this.out, chunkPixels = this.pixels;
    const inverseRun = 1 / run;
    const into = k * count;
    let index = k * CHUNK;
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
