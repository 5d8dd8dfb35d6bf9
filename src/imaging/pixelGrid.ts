import { InputError, expectedFound } from '../errors.js';

/**
 * A rectangular pixel grid centred on the origin. Pixel (i, j) (column i, row j, 0-based) has
 * its centre at x = (i - (columns - 1) / 2) s, y = (j - (rows - 1) / 2) s, s = pixelScaleArcsec;
 * images are stored row-major, pixel (i, j) at index j * columns + i.
 */
export interface PixelGrid {
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
}

/** Validates and builds a grid; `key` names the config entry in error messages. */
export function pixelGrid(columns: number, rows: number, pixelScaleArcsec: number, key = 'grid'): PixelGrid {
  if (!Number.isInteger(columns) || columns < 1) {
    throw new InputError(expectedFound('a whole number of columns >= 1', columns), { key: `${key}.columns` });
  }
  if (!Number.isInteger(rows) || rows < 1) {
    throw new InputError(expectedFound('a whole number of rows >= 1', rows), { key: `${key}.rows` });
  }
  if (!(pixelScaleArcsec > 0) || !Number.isFinite(pixelScaleArcsec)) {
    throw new InputError(expectedFound('a pixel scale in arcsec > 0', pixelScaleArcsec), { key: `${key}.pixelScaleArcsec` });
  }
  return { columns, rows, pixelScaleArcsec };
}

export function pixelCount(grid: PixelGrid): number {
  return grid.columns * grid.rows;
}

/** Sky position of the centre of column i (x) and of row j (y). */
export function pixelCentreX(grid: PixelGrid, i: number): number {
  return (i - (grid.columns - 1) / 2) * grid.pixelScaleArcsec;
}
export function pixelCentreY(grid: PixelGrid, j: number): number {
  return (j - (grid.rows - 1) / 2) * grid.pixelScaleArcsec;
}

/** Fills x, y (length >= columns * rows) with the pixel centres, row-major. */
export function fillPixelCentres(grid: PixelGrid, x: Float64Array, y: Float64Array): void {
  fillSupersampledCentres(grid, 1, x, y);
}

/**
 * Fills x, y (length >= columns * rows * factor^2) with the centres of factor x factor
 * sub-pixels per pixel. Pixel-major layout: the sub-pixels of pixel p = j * columns + i are
 * the contiguous run [p f^2, (p + 1) f^2), sub-pixel (a, b) (column a, row b inside the pixel)
 * at p f^2 + b f + a, centred at (pixel centre) + ((a - (f - 1) / 2) s / f, (b - (f - 1) / 2) s / f).
 * So binning to pixels is a plain loop over runs (binSupersampled).
 */
export function fillSupersampledCentres(grid: PixelGrid, factor: number, x: Float64Array, y: Float64Array): void {
  const { columns, rows } = grid;
  let index = 0;
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      index = writeSubPixels(grid, factor, i, j, x, y, index);
    }
  }
}

/**
 * As fillSupersampledCentres, for only the listed pixels (row-major indices, e.g. the used
 * pixels of a mask): the sub-pixels of pixelIndices[k] occupy [k f^2, (k + 1) f^2).
 */
export function fillSubsetCentres(
  grid: PixelGrid, factor: number, pixelIndices: ArrayLike<number>, x: Float64Array, y: Float64Array,
): void {
  const columns = grid.columns;
  let index = 0;
  for (let k = 0; k < pixelIndices.length; k++) {
    const p = pixelIndices[k];
    const j = Math.floor(p / columns);
    index = writeSubPixels(grid, factor, p - j * columns, j, x, y, index);
  }
}

function writeSubPixels(
  grid: PixelGrid, factor: number, i: number, j: number, x: Float64Array, y: Float64Array, index: number,
): number {
  const subScale = grid.pixelScaleArcsec / factor;
  const firstOffset = -((factor - 1) / 2) * subScale;
  const x0 = pixelCentreX(grid, i) + firstOffset;
  const y0 = pixelCentreY(grid, j) + firstOffset;
  for (let b = 0; b < factor; b++) {
    const yb = y0 + b * subScale;
    for (let a = 0; a < factor; a++) {
      x[index] = x0 + a * subScale;
      y[index] = yb;
      index++;
    }
  }
  return index;
}

/**
 * Mean over each run of factor^2 sub-pixel values (the layout of fillSupersampledCentres and
 * fillSubsetCentres): out[k] = mean(fine[k f^2 .. (k + 1) f^2 - 1]) for k < pixelCount. For a
 * surface brightness this is the midpoint-rule average over the pixel (common practice).
 */
export function binSupersampled(fine: Float64Array, factor: number, pixelCount: number, out: Float64Array): void {
  const run = factor * factor;
  const inverseRun = 1 / run;
  let index = 0;
  for (let k = 0; k < pixelCount; k++) {
    let sum = 0;
    for (let m = 0; m < run; m++) sum += fine[index + m];
    out[k] = sum * inverseRun;
    index += run;
  }
}
