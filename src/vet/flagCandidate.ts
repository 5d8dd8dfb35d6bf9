import type { CelestialWcsDescription } from '../fits/index.js';

/** One place flagged for vetting, in arcsift's image-plane convention (arcsec from the centre). */
export interface FlagCandidate {
  /** The id given in the flag list, or its position in the list (1, 2, ...). */
  readonly id: string;
  readonly xArcsec: number;
  readonly yArcsec: number;
  /** The network's score (a list's `score` column, or a map's peak value), when given. */
  readonly score: number | undefined;
  /** Where it came from, for messages: e.g. `flags.csv line 3` or `map.fits pixel (20, 31)`. */
  readonly origin: string;
}

/** The image grid flags are placed on (the observed data's), with its sky when the image has a celestial WCS. */
export interface FlagGrid {
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
  readonly wcs?: CelestialWcsDescription;
}

/** x of a (possibly fractional) column index: x = (i - (columns - 1) / 2) * scale (README conventions). */
export function columnToXArcsec(column: number, grid: FlagGrid): number {
  return (column - (grid.columns - 1) / 2) * grid.pixelScaleArcsec;
}

/** y of a (possibly fractional) row index: y = (j - (rows - 1) / 2) * scale (README conventions). */
export function rowToYArcsec(row: number, grid: FlagGrid): number {
  return (row - (grid.rows - 1) / 2) * grid.pixelScaleArcsec;
}

/** Half the image's extent along x and y, in arcsec: the image covers |x| <= halfWidth, |y| <= halfHeight. */
export function imageHalfExtentArcsec(grid: FlagGrid): { readonly halfWidth: number; readonly halfHeight: number } {
  return { halfWidth: (grid.columns / 2) * grid.pixelScaleArcsec, halfHeight: (grid.rows / 2) * grid.pixelScaleArcsec };
}

/** The pixel (column, row) holding a position, or undefined outside the image. */
export function pixelOfPosition(xArcsec: number, yArcsec: number, grid: FlagGrid): readonly [number, number] | undefined {
  const i = Math.round(xArcsec / grid.pixelScaleArcsec + (grid.columns - 1) / 2);
  const j = Math.round(yArcsec / grid.pixelScaleArcsec + (grid.rows - 1) / 2);
  if (i < 0 || j < 0 || i >= grid.columns || j >= grid.rows) return undefined;
  return [i, j];
}
