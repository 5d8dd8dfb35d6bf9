import type { PixelGrid } from '../imaging/pixelGrid.js';
import { traceRays } from '../lensing/lensEquation.js';
import type { MassTerm } from '../lensing/massTerm.js';

/**
 * Fixed image-plane rays through a list of pixels, r x r per pixel at the midpoints of a regular
 * sub-pixel grid (pixel e's rays at e * r^2 .. e * r^2 + r^2 - 1, in row order), traced through
 * the lens at every call. Buffers are allocated here; trace() allocates nothing.
 */
export class SourceRays {
  readonly raysPerPixel: number;
  readonly count: number;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly betaX: Float64Array;
  readonly betaY: Float64Array;
  private readonly alphaX: Float64Array;
  private readonly alphaY: Float64Array;

  /** `raysPerSide`: r; 1 gives the pixel centres. */
  constructor(grid: PixelGrid, pixels: Int32Array, raysPerSide: number) {
    const { columns, rows, pixelScaleArcsec: scale } = grid;
    const r = raysPerSide;
    this.raysPerPixel = r * r;
    this.count = pixels.length * r * r;
    this.x = new Float64Array(this.count);
    this.y = new Float64Array(this.count);
    let k = 0;
    for (let e = 0; e < pixels.length; e++) {
      const i = pixels[e] % columns;
      const j = (pixels[e] - i) / columns;
      for (let b = 0; b < r; b++) {
        for (let a = 0; a < r; a++) {
          this.x[k] = (i - (columns - 1) / 2 + (a + 0.5) / r - 0.5) * scale;
          this.y[k] = (j - (rows - 1) / 2 + (b + 0.5) / r - 0.5) * scale;
          k++;
        }
      }
    }
    this.betaX = new Float64Array(this.count);
    this.betaY = new Float64Array(this.count);
    this.alphaX = new Float64Array(this.count);
    this.alphaY = new Float64Array(this.count);
  }

  /** Source-plane positions of every ray for the profile vector p. */
  trace(massTerms: readonly MassTerm[], p: Float64Array): void {
    traceRays(massTerms, p, this.x, this.y, this.count, this.alphaX, this.alphaY, this.betaX, this.betaY);
  }
}
