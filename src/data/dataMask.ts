import { InputError, expectedFound } from '../errors.js';
import { sharedInt32Array, sharedUint8Array } from './sharedArrays.js';

/** A checked mask and the row-major indices of the pixels it uses. */
export interface DataMask {
  readonly mask: Uint8Array<SharedArrayBuffer>;
  readonly usedPixels: Int32Array<SharedArrayBuffer>;
}

/**
 * Mask values read from `file` as flags (1 = used), each checked to be exactly 0 or 1 (a BLANK
 * pixel reads as NaN and is refused too). Throws InputError naming the first bad pixel.
 */
export function maskFlagsFromValues(values: Float64Array, columns: number, file: string): Uint8Array {
  const flags = new Uint8Array(values.length);
  for (let k = 0; k < values.length; k++) {
    const value = values[k];
    if (value === 1) {
      flags[k] = 1;
    } else if (value !== 0) {
      throw new InputError(`mask value: ${expectedFound('0 (pixel not used) or 1 (pixel used)', value)}`, {
        file, pixel: [k % columns, Math.floor(k / columns)],
      });
    }
  }
  return flags;
}

/** A checked mask on shared memory from 0/1 flags; InputError naming `what` (and `file`) when no pixel is used. */
export function dataMaskFromFlags(flags: Uint8Array, what: string, file?: string): DataMask {
  const mask = sharedUint8Array(flags.length);
  let used = 0;
  for (let k = 0; k < flags.length; k++) {
    mask[k] = flags[k] === 0 ? 0 : 1;
    used += mask[k];
  }
  if (used === 0) throw new InputError(`${what} uses no pixel: expected at least one pixel equal to 1, found only 0`, { file });
  const usedPixels = sharedInt32Array(used);
  let n = 0;
  for (let k = 0; k < mask.length; k++) if (mask[k] === 1) usedPixels[n++] = k;
  return { mask, usedPixels };
}
