import { InputError, expectedFound } from '../errors.js';

/** One grid position of a sensitivity map. */
export interface SensitivityPoint {
  readonly xArcsec: number;
  readonly yArcsec: number;
  /** Grid indices (a along x, b along y), 0-based. */
  readonly a: number;
  readonly b: number;
  /** The image pixel holding the point. */
  readonly column: number;
  readonly row: number;
}

/** The grid: its points inside the mask, and the pixel box it spans. */
export interface SensitivityGrid {
  readonly n: number;
  readonly points: readonly SensitivityPoint[];
  /** Column and row range of the mask's pixels (inclusive). */
  readonly box: { readonly iMin: number; readonly iMax: number; readonly jMin: number; readonly jMax: number };
}

/**
 * An n x n grid of positions spanning the bounding box of the mask's pixel centres (end points
 * included; one point at the box centre when n = 1), keeping the points whose pixel is in the mask.
 */
export function sensitivityGrid(
  data: { readonly columns: number; readonly rows: number; readonly pixelScaleArcsec: number; readonly mask: Uint8Array }, n: number,
): SensitivityGrid {
  if (!Number.isInteger(n) || n < 1) throw new InputError(`--grid: ${expectedFound('a whole number >= 1', n)}`);
  const { columns, rows, mask } = data;
  let iMin = columns;
  let iMax = -1;
  let jMin = rows;
  let jMax = -1;
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      if (mask[i + columns * j] === 0) continue;
      iMin = Math.min(iMin, i); iMax = Math.max(iMax, i);
      jMin = Math.min(jMin, j); jMax = Math.max(jMax, j);
    }
  }
  const points: SensitivityPoint[] = [];
  const at = (min: number, max: number, k: number): number => (n === 1 ? 0.5 * (min + max) : min + ((max - min) * k) / (n - 1));
  for (let b = 0; b < n; b++) {
    for (let a = 0; a < n; a++) {
      const i = at(iMin, iMax, a);
      const j = at(jMin, jMax, b);
      const column = Math.round(i);
      const row = Math.round(j);
      if (mask[column + columns * row] === 0) continue;
      points.push({
        xArcsec: (i - (columns - 1) / 2) * data.pixelScaleArcsec,
        yArcsec: (j - (rows - 1) / 2) * data.pixelScaleArcsec,
        a, b, column, row,
      });
    }
  }
  return { n, points, box: { iMin, iMax, jMin, jMax } };
}

/** The grid indices (a, b) of the grid point nearest to pixel (i, j). */
export function nearestGridIndex(grid: SensitivityGrid, i: number, j: number): readonly [number, number] {
  const { iMin, iMax, jMin, jMax } = grid.box;
  const n = grid.n;
  const along = (v: number, min: number, max: number): number =>
    n === 1 || max === min ? 0 : Math.min(n - 1, Math.max(0, Math.round(((v - min) / (max - min)) * (n - 1))));
  return [along(i, iMin, iMax), along(j, jMin, jMax)];
}
