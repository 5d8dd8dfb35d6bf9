import { InputError, expectedFound } from '../errors.js';
import { sharedFloat64Array } from './sharedArrays.js';

/** Pixel values kept inside a mask, with what was found outside it. */
export interface MaskedPixelValues {
  readonly values: Float64Array<SharedArrayBuffer>;
  /** How many pixels outside the mask held NaN or an infinite value. */
  readonly nonFiniteOutside: number;
}

/**
 * Copies `values` to shared memory, checking each pixel inside the mask: finite, and positive
 * too when `positive` is set. Pixels outside the mask become `outsideValue`, whatever they held.
 * The first pixel that fails (in row-major order) throws InputError naming `file`, `what` and
 * the pixel as (column, row) of the file: `offset` is the file's (column, row) of values[0], for
 * values cut out of a larger frame.
 */
export function maskedPixelValues(
  values: Float64Array, mask: Uint8Array, columns: number, outsideValue: number, positive: boolean, file: string, what: string,
  offset: readonly [number, number] = [0, 0],
): MaskedPixelValues {
  const out = sharedFloat64Array(values.length);
  let nonFiniteOutside = 0;
  for (let k = 0; k < values.length; k++) {
    const value = values[k];
    if (mask[k] === 0) {
      out[k] = outsideValue;
      if (!Number.isFinite(value)) nonFiniteOutside++;
      continue;
    }
    if (!Number.isFinite(value) || (positive && !(value > 0))) {
      const expected = positive ? 'a finite value above 0 inside the mask' : 'a finite value inside the mask';
      throw new InputError(`${what}: ${expectedFound(expected, value)}`, { file, pixel: [offset[0] + (k % columns), offset[1] + Math.floor(k / columns)] });
    }
    out[k] = value;
  }
  return { values: out, nonFiniteOutside };
}
