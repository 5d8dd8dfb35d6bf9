import { InputError } from '../errors.js';
import type { Bitpix } from './bitpix.js';

/** How to store one image: its type, the linear scaling of integer types, and the integer that stands for NaN. */
export interface PixelEncoding {
  readonly bitpix: Bitpix;
  readonly bscale: number;
  readonly bzero: number;
  readonly blank?: number;
  /** Row length (NAXIS1), to name the offending pixel as (column, row). */
  readonly nx: number;
  readonly source?: string;
}

const STORED_RANGE: Readonly<Record<8 | 16 | 32 | 64, readonly [number, number]>> = {
  8: [0, 255],
  16: [-32768, 32767],
  32: [-2147483648, 2147483647],
  // 2^63 is the first double above the int64 range; the check below is exclusive at the top.
  64: [-9223372036854775808, 9223372036854775808],
};

function pixelError(encoding: PixelEncoding, i: number, problem: string): InputError {
  return new InputError(`cannot store this pixel with BITPIX ${encoding.bitpix}: ${problem}`, {
    file: encoding.source,
    pixel: [i % encoding.nx, Math.floor(i / encoding.nx)],
  });
}

/**
 * Stored integer for a physical value, the inverse of FITS Standard 4.0 sec. 4.4.2.5:
 * stored = round((physical - BZERO) / BSCALE), NaN stored as BLANK. Rounds halves upwards
 * (Math.round).
 */
function storedInteger(value: number, i: number, encoding: PixelEncoding, bits: 8 | 16 | 32 | 64): number {
  if (Number.isNaN(value)) {
    if (encoding.blank === undefined) throw pixelError(encoding, i, 'the value is NaN and no BLANK integer was given');
    return encoding.blank;
  }
  const stored = Math.round((value - encoding.bzero) / encoding.bscale);
  const [lowest, highest] = STORED_RANGE[bits];
  if (!(stored >= lowest && (bits === 64 ? stored < highest : stored <= highest))) {
    throw pixelError(
      encoding,
      i,
      `the value ${value} becomes the stored integer ${stored} with BSCALE=${encoding.bscale}, BZERO=${encoding.bzero}, outside ${lowest}..${bits === 64 ? '2^63-1' : highest}`,
    );
  }
  return stored;
}

/**
 * Big-endian stored values of `data` (FITS Standard 4.0 sec. 5.2-5.3) written into `out`
 * from `offset` on. Integer types are scaled and range-checked; a finite value too large for
 * a 32-bit float is an error rather than a silent infinity.
 */
export function encodePixels(data: Float64Array, encoding: PixelEncoding, out: Uint8Array, offset: number): void {
  const count = data.length;
  const view = new DataView(out.buffer, out.byteOffset + offset, count * (Math.abs(encoding.bitpix) / 8));
  switch (encoding.bitpix) {
    case 8:
      for (let i = 0; i < count; i++) view.setUint8(i, storedInteger(data[i], i, encoding, 8));
      return;
    case 16:
      for (let i = 0; i < count; i++) view.setInt16(2 * i, storedInteger(data[i], i, encoding, 16), false);
      return;
    case 32:
      for (let i = 0; i < count; i++) view.setInt32(4 * i, storedInteger(data[i], i, encoding, 32), false);
      return;
    case 64:
      for (let i = 0; i < count; i++) view.setBigInt64(8 * i, BigInt(storedInteger(data[i], i, encoding, 64)), false);
      return;
    case -32:
      for (let i = 0; i < count; i++) {
        const value = data[i];
        if (Number.isFinite(value) && !Number.isFinite(Math.fround(value))) {
          throw pixelError(encoding, i, `the value ${value} is beyond the range of a 32-bit float`);
        }
        view.setFloat32(4 * i, value, false);
      }
      return;
    case -64:
      for (let i = 0; i < count; i++) view.setFloat64(8 * i, data[i], false);
      return;
  }
}
