import type { PixelGrid } from '../imaging/pixelGrid.js';
import type { PixelLattice } from './pixelLattice.js';
import type { PixelMeanState } from './pixelMeanState.js';
import { shine, type MeanLightTerm, type RayChunk } from './rayChunk.js';

/** Largest change of the light at a predicted position, in tolerances, that lets a pixel use interpolated rays. */
const INTERPOLATION_GUARD = 5;

/**
 * Sub-pixel source-plane positions interpolated from the lattice instead of traced, for the pixels
 * where that is safe. The check: the traced position at the pixel centre is predicted from its four
 * lattice neighbours along x, and along y, by cubic Lagrange interpolation (nodes -2, -1, 1, 2:
 * weights -1/6, 2/3, 2/3, -1/6), and the light at both predictions must differ from the light of
 * the traced centre by at most INTERPOLATION_GUARD (5) times the tolerance. The error of that
 * prediction, h^4 b^(4) / 6, exceeds the error of the degree-4 interpolation used for the
 * sub-pixels, |w(t)| h^5 b^(5) / 120 with |w(t)| <= 1.41 for |t| <= 1/2 (Abramowitz & Stegun
 * 1964, 25.2.3), roughly 14 r / (5 h)-fold for deflections whose k-th derivatives scale as k!/r^k
 * (r the distance to the nearest mass centre): at least 20-fold for r >= 0.35 arcsec and
 * h = 0.05 arcsec, so 5 tolerances at the prediction mean at most a quarter of one at the
 * sub-pixels. The check fails near the centre of a cuspy perturber, where interpolation would.
 */
export class SubPixelInterpolation {
  /** 1 where a listed pixel's sub-pixel rays may be interpolated (after check). */
  readonly interpolable: Uint8Array;
  private readonly lattice: PixelLattice;
  private readonly state: PixelMeanState;
  private readonly grid: PixelGrid;
  private readonly pixels: Int32Array;
  private readonly chunk: RayChunk;
  private readonly lightTerms: readonly MeanLightTerm[];
  private readonly rowX = new Float64Array(5 * 64);
  private readonly rowY = new Float64Array(5 * 64);
  private readonly weightsByFactor = new Map<number, Float64Array>();

  constructor(
    lattice: PixelLattice, state: PixelMeanState, grid: PixelGrid, pixels: Int32Array, chunk: RayChunk,
    lightTerms: readonly MeanLightTerm[], factors: Int32Array,
  ) {
    this.lattice = lattice;
    this.state = state;
    this.grid = grid;
    this.pixels = pixels;
    this.chunk = chunk;
    this.lightTerms = lightTerms;
    this.interpolable = new Uint8Array(pixels.length);
    for (const m of factors) this.lagrangeWeights(m);
  }

  /** Marks which pixels of list[0..listCount) may use interpolated sub-pixel rays (see the class). */
  check(p: Float64Array, list: Int32Array, listCount: number): void {
    const perChunk = this.chunk.size / 2;
    const chunk = this.chunk;
    for (let start = 0; start < listCount; start += perChunk) {
      const end = Math.min(listCount, start + perChunk);
      const r = this.predictCentres(list, start, end);
      shine(this.lightTerms, p, chunk.x, chunk.y, chunk.bx, chunk.by, r, chunk.out, chunk.size);
      this.markInterpolable(list, start, end);
    }
  }

  /**
   * For list[start..end): the pixel centre twice in the chunk with the source-plane position
   * predicted along x, then along y; returns the number of rays.
   */
  private predictCentres(list: Int32Array, start: number, end: number): number {
    const { columns, rows, pixelScaleArcsec: scale } = this.grid;
    const width = this.lattice.width;
    const pixelsPadded = this.lattice.pixelsPadded;
    const betaX = this.lattice.betaX, betaY = this.lattice.betaY;
    const { x, y, bx, by } = this.chunk;
    let r = 0;
    for (let t = start; t < end; t++) {
      const e = list[t];
      const q = pixelsPadded[e];
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
    const values = this.lattice.values;
    const planeSize = this.lattice.planeSize;
    const pixelsPadded = this.lattice.pixelsPadded;
    const out = this.chunk.out;
    const size = this.chunk.size;
    const { basisCount, scale, relativeTolerance } = this.state;
    for (let t = start, u = 0; t < end; t++, u += 2) {
      const e = list[t];
      const q = pixelsPadded[e];
      // Last basis first, stopping at the first that fails (the fast-varying bases of a
      // many-basis source come last and fail most often).
      let ok = 1;
      for (let k = basisCount - 1; k >= 0 && ok === 1; k--) {
        const centre = values[k * planeSize + q];
        const worst = Math.max(Math.abs(out[k * size + u] - centre), Math.abs(out[k * size + u + 1] - centre));
        if (worst > INTERPOLATION_GUARD * scale[k] * relativeTolerance[e]) ok = 0;
      }
      this.interpolable[e] = ok;
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
  interpolatedBeta(e: number, m: number, weights: Float64Array, bx: Float64Array, by: Float64Array, r: number): void {
    const width = this.lattice.width;
    const q = this.lattice.pixelsPadded[e];
    const rowX = this.rowX, rowY = this.rowY;
    const betaX = this.lattice.betaX, betaY = this.lattice.betaY;
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
  lagrangeWeights(m: number): Float64Array {
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
}
