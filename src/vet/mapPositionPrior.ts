import { InputError } from '../errors.js';
import type { FlagGrid } from './flagCandidate.js';
import type { ProbabilityMap } from './readProbabilityMap.js';

/**
 * A two-dimensional prior on a position, proportional to a probability map over the pixels of
 * the mask and uniform within each pixel. A unit-square point (u, v) maps to a position by the
 * conditional inverse-CDF transform (Rosenblatt 1952): v picks the row through the cumulative
 * distribution of the rows' total probability, the fraction of v left inside that row's share
 * places y uniformly within the row; u then picks the column through the row's own cumulative
 * distribution and its leftover fraction places x within the pixel. The map is so turned into a
 * transform of the unit cube, the form nested sampling needs, and the pixel chosen has exactly
 * the map's probability (normalised over the mask).
 */
export class MapPositionPrior {
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
  /** Normalised probability of each pixel (row-major), 0 outside the mask. */
  readonly probability: Float64Array;
  /** Cumulative probability of rows 0..j-1 at index j (rows + 1 entries, last = 1). */
  private readonly rowCdf: Float64Array;
  /** Per row j, the cumulative conditional probability of columns 0..i-1 at j * (columns + 1) + i. */
  private readonly columnCdf: Float64Array;
  /** Bounding box of the pixels with positive probability, arcsec (pixel edges). */
  readonly bounds: { readonly xMin: number; readonly xMax: number; readonly yMin: number; readonly yMax: number };

  constructor(map: ProbabilityMap, mask: Uint8Array, grid: FlagGrid) {
    const { columns, rows } = grid;
    this.columns = columns;
    this.rows = rows;
    this.pixelScaleArcsec = grid.pixelScaleArcsec;
    let total = 0;
    for (let p = 0; p < map.values.length; p++) if (mask[p] !== 0) total += map.values[p];
    if (!(total > 0)) {
      throw new InputError('probability map as a position prior: expected some positive values inside the mask, found only zeros', { file: map.file });
    }
    this.probability = new Float64Array(columns * rows);
    this.rowCdf = new Float64Array(rows + 1);
    this.columnCdf = new Float64Array(rows * (columns + 1));
    let iMin = columns;
    let iMax = -1;
    let jMin = rows;
    let jMax = -1;
    for (let j = 0; j < rows; j++) {
      let rowSum = 0;
      for (let i = 0; i < columns; i++) {
        const p = i + columns * j;
        const q = mask[p] !== 0 ? map.values[p] / total : 0;
        this.probability[p] = q;
        rowSum += q;
        if (q > 0) {
          iMin = Math.min(iMin, i); iMax = Math.max(iMax, i);
          jMin = Math.min(jMin, j); jMax = Math.max(jMax, j);
        }
      }
      this.rowCdf[j + 1] = this.rowCdf[j] + rowSum;
      const base = j * (columns + 1);
      let running = 0;
      for (let i = 0; i < columns; i++) {
        this.columnCdf[base + i] = rowSum > 0 ? running / rowSum : 0;
        running += this.probability[i + columns * j];
      }
      this.columnCdf[base + columns] = 1;
    }
    this.rowCdf[rows] = 1;
    const s = grid.pixelScaleArcsec;
    this.bounds = {
      xMin: (iMin - 0.5 - (columns - 1) / 2) * s,
      xMax: (iMax + 0.5 - (columns - 1) / 2) * s,
      yMin: (jMin - 0.5 - (rows - 1) / 2) * s,
      yMax: (jMax + 0.5 - (rows - 1) / 2) * s,
    };
  }

  /** Writes x (arcsec) to out[xAt] and y to out[yAt] for the unit-square point (u, v). */
  fromUnit(u: number, v: number, out: Float64Array, xAt: number, yAt: number): void {
    const rowCdf = this.rowCdf;
    const j = lastBelowOrAt(rowCdf, 0, this.rows, v);
    const rowShare = rowCdf[j + 1] - rowCdf[j];
    const fy = Math.min(1, Math.max(0, (v - rowCdf[j]) / rowShare));
    const base = j * (this.columns + 1);
    const i = lastBelowOrAt(this.columnCdf, base, this.columns, u);
    const columnShare = this.columnCdf[base + i + 1] - this.columnCdf[base + i];
    const fx = Math.min(1, Math.max(0, (u - this.columnCdf[base + i]) / columnShare));
    const s = this.pixelScaleArcsec;
    out[xAt] = (i - 0.5 + fx - (this.columns - 1) / 2) * s;
    out[yAt] = (j - 0.5 + fy - (this.rows - 1) / 2) * s;
  }
}

/**
 * The index k in [0, count) with cdf[offset + k] <= value < cdf[offset + k + 1], skipping empty
 * bins (equal neighbours), by bisection; value 1 gives the last non-empty bin.
 */
function lastBelowOrAt(cdf: Float64Array, offset: number, count: number, value: number): number {
  let low = 0;
  let high = count;
  // Invariant: cdf[offset + low] <= value (or low = 0) and value < cdf[offset + high] (or high = count).
  while (high - low > 1) {
    const mid = (low + high) >>> 1;
    if (cdf[offset + mid] <= value) low = mid;
    else high = mid;
  }
  // Step back over empty bins at the top (value = 1 lands past the last positive one).
  while (low > 0 && cdf[offset + low + 1] - cdf[offset + low] <= 0) low--;
  // And forward over empty bins at the bottom (value = 0 before the first positive one).
  while (low < count - 1 && cdf[offset + low + 1] - cdf[offset + low] <= 0) low++;
  return low;
}
