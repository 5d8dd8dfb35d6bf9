import { InputError, describeValue } from '../errors.js';
import { readFitsImage } from '../fits/index.js';
import { readNpy } from '../io/readNpy.js';
import type { FlagGrid } from './flagCandidate.js';

/** A network's probability map, aligned pixel for pixel with the observed image. */
export interface ProbabilityMap {
  readonly file: string;
  /** Row-major, index i + columns * j; inside the mask every value is in [0, 1], outside it 0. */
  readonly values: Float64Array;
  readonly columns: number;
  readonly rows: number;
}

/** Whether a flags path names a map (FITS or NPY; an .npz archive is read only to be refused clearly) rather than a CSV list. */
export function isProbabilityMapFile(file: string): boolean {
  return /\.(fits|fit|fts|npy|npz)$/i.test(file);
}

/**
 * Reads a probability map from FITS (first 2-D image HDU, NAXIS1 = columns) or NPY (shape
 * (rows, columns), array[j, i] = row j, column i) and checks it against the image: the same
 * columns and rows, and inside the mask finite values in [0, 1]. Values outside the mask are
 * not used (set to 0). InputError names the file and, for one value, the pixel.
 */
export function readProbabilityMap(file: string, grid: FlagGrid, mask: Uint8Array): ProbabilityMap {
  const npy = /\.np[yz]$/i.test(file);
  const image = npy ? readNpy(file) : readFitsImage(file);
  if (image.nx !== grid.columns || image.ny !== grid.rows) {
    const found = npy ? `numpy shape (${image.ny}, ${image.nx})` : `${image.nx} x ${image.ny} (NAXIS1 x NAXIS2)`;
    const expected = npy ? `numpy shape (${grid.rows}, ${grid.columns}) (rows, columns)` : `${grid.columns} x ${grid.rows} pixels (columns x rows)`;
    throw new InputError(`probability map shape: expected ${expected}, the image's, found ${found}`, { file });
  }
  const values = new Float64Array(image.data.length);
  for (let p = 0; p < values.length; p++) {
    if (mask[p] === 0) continue;
    const v = image.data[p];
    if (!(v >= 0 && v <= 1)) {
      const pixel = [p % grid.columns, Math.floor(p / grid.columns)] as const;
      throw new InputError(`probability map value inside the mask: expected a probability in [0, 1], found ${describeValue(v)}`, { file, pixel });
    }
    values[p] = v;
  }
  return { file, values, columns: grid.columns, rows: grid.rows };
}
