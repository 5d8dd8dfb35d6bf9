import { InputError, expectedFound } from '../errors.js';
import { pixelCentreX, pixelCentreY, pixelCount, type PixelGrid } from './pixelGrid.js';

/** A pixel mask over a grid, row-major: 1 = pixel used in the fit, 0 = ignored. */
export type PixelMask = Uint8Array;

/** Every pixel used. */
export function allPixelsMask(grid: PixelGrid): PixelMask {
  return new Uint8Array(pixelCount(grid)).fill(1);
}

/**
 * Pixels whose centres lie at innerRadiusArcsec <= r <= outerRadiusArcsec from
 * (centerXArcsec, centerYArcsec); an inner radius of 0 gives a disc.
 */
export function annulusMask(
  grid: PixelGrid, innerRadiusArcsec: number, outerRadiusArcsec: number, centerXArcsec = 0, centerYArcsec = 0,
): PixelMask {
  if (!(innerRadiusArcsec >= 0)) {
    throw new InputError(expectedFound('an inner radius in arcsec >= 0', innerRadiusArcsec), { key: 'mask.innerRadiusArcsec' });
  }
  if (!(outerRadiusArcsec > innerRadiusArcsec)) {
    throw new InputError(expectedFound(`an outer radius in arcsec > the inner radius ${innerRadiusArcsec}`, outerRadiusArcsec), {
      key: 'mask.outerRadiusArcsec',
    });
  }
  const inner2 = innerRadiusArcsec * innerRadiusArcsec;
  const outer2 = outerRadiusArcsec * outerRadiusArcsec;
  const mask = new Uint8Array(pixelCount(grid));
  for (let j = 0; j < grid.rows; j++) {
    const dy = pixelCentreY(grid, j) - centerYArcsec;
    for (let i = 0; i < grid.columns; i++) {
      const dx = pixelCentreX(grid, i) - centerXArcsec;
      const r2 = dx * dx + dy * dy;
      mask[j * grid.columns + i] = r2 >= inner2 && r2 <= outer2 ? 1 : 0;
    }
  }
  return mask;
}

/** Pixels whose centres lie within radiusArcsec of the centre. */
export function discMask(grid: PixelGrid, radiusArcsec: number, centerXArcsec = 0, centerYArcsec = 0): PixelMask {
  return annulusMask(grid, 0, radiusArcsec, centerXArcsec, centerYArcsec);
}

/**
 * A mask from an image of the grid's size (e.g. a FITS mask): non-zero = used. NaN or infinite
 * values are refused, naming the pixel and `file`.
 */
export function maskFromImage(values: ArrayLike<number>, grid: PixelGrid, file?: string): PixelMask {
  const count = pixelCount(grid);
  if (values.length !== count) {
    throw new InputError(
      `mask image: ${expectedFound(`${grid.columns} x ${grid.rows} = ${count} pixels`, values.length)}`, { file },
    );
  }
  const mask = new Uint8Array(count);
  for (let k = 0; k < count; k++) {
    const value = values[k];
    if (!Number.isFinite(value)) {
      const pixel = [k % grid.columns, Math.floor(k / grid.columns)] as const;
      throw new InputError(`mask image: ${expectedFound('a finite value (0 = ignored, other = used)', value)}`, { file, pixel });
    }
    mask[k] = value !== 0 ? 1 : 0;
  }
  return mask;
}

/** Row-major indices of the used pixels, ascending. */
export function usedPixelIndices(mask: PixelMask): Int32Array {
  let count = 0;
  for (let k = 0; k < mask.length; k++) count += mask[k] !== 0 ? 1 : 0;
  const indices = new Int32Array(count);
  let next = 0;
  for (let k = 0; k < mask.length; k++) if (mask[k] !== 0) indices[next++] = k;
  return indices;
}
