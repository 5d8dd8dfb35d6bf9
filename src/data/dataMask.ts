import { InputError, expectedFound } from '../errors.js';
import { sharedInt32Array, sharedUint8Array } from './sharedArrays.js';

/** A checked mask and the row-major indices of the pixels it uses. */
export interface DataMask {
  readonly mask: Uint8Array<SharedArrayBuffer>;
  readonly usedPixels: Int32Array<SharedArrayBuffer>;
}

/**
 * Checks mask values read from `file` (each exactly 0 or 1; a BLANK pixel reads as NaN and is
 * refused too) and that at least one pixel is used. Throws InputError naming the first bad pixel.
 */
export function dataMaskFromValues(values: Float64Array, columns: number, file: string): DataMask {
  const mask = sharedUint8Array(values.length);
  let used = 0;
  for (let k = 0; k < values.length; k++) {
    const value = values[k];
    if (value === 1) {
      mask[k] = 1;
      used++;
    } else if (value !== 0) {
      throw new InputError(`mask value: ${expectedFound('0 (pixel not used) or 1 (pixel used)', value)}`, {
        file, pixel: [k % columns, Math.floor(k / columns)],
      });
    }
  }
  if (used === 0) throw new InputError('mask uses no pixel: expected at least one pixel equal to 1, found only 0', { file });
  return { mask, usedPixels: usedPixelsOf(mask, used) };
}

/** A mask using every one of `count` pixels. */
export function fullDataMask(count: number): DataMask {
  const mask = sharedUint8Array(count).fill(1);
  return { mask, usedPixels: usedPixelsOf(mask, count) };
}

function usedPixelsOf(mask: Uint8Array, used: number): Int32Array<SharedArrayBuffer> {
  const usedPixels = sharedInt32Array(used);
  let n = 0;
  for (let k = 0; k < mask.length; k++) if (mask[k] === 1) usedPixels[n++] = k;
  return usedPixels;
}
