import type { Bitpix } from './bitpix.js';

/** A bigint no 64-bit integer equals, standing for "no BLANK". */
const NO_BLANK_64 = 1n << 64n;

/**
 * Physical values from big-endian stored values, physical = BZERO + BSCALE x stored (FITS
 * Standard 4.0 sec. 4.4.2.5 and 5.2-5.3); integers equal to BLANK become NaN. Writes `count`
 * values into `out` from `bytes[offset]` on; the BITPIX switch sits outside the loops.
 */
export function decodePixels(
  bytes: Uint8Array,
  offset: number,
  count: number,
  bitpix: Bitpix,
  bscale: number,
  bzero: number,
  blank: number | undefined,
  out: Float64Array,
): void {
  const view = new DataView(bytes.buffer, bytes.byteOffset + offset, count * (Math.abs(bitpix) / 8));
  // NaN never equals a stored integer, so a missing BLANK needs no branch in the loops.
  const blankValue = blank === undefined ? Number.NaN : blank;
  switch (bitpix) {
    case 8:
      for (let i = 0; i < count; i++) {
        const stored = view.getUint8(i);
        out[i] = stored === blankValue ? Number.NaN : bzero + bscale * stored;
      }
      return;
    case 16:
      for (let i = 0; i < count; i++) {
        const stored = view.getInt16(2 * i, false);
        out[i] = stored === blankValue ? Number.NaN : bzero + bscale * stored;
      }
      return;
    case 32:
      for (let i = 0; i < count; i++) {
        const stored = view.getInt32(4 * i, false);
        out[i] = stored === blankValue ? Number.NaN : bzero + bscale * stored;
      }
      return;
    case 64: {
      const blank64 = blank === undefined ? NO_BLANK_64 : BigInt(blank);
      for (let i = 0; i < count; i++) {
        const stored = view.getBigInt64(8 * i, false);
        out[i] = stored === blank64 ? Number.NaN : bzero + bscale * Number(stored);
      }
      return;
    }
    case -32:
      for (let i = 0; i < count; i++) out[i] = bzero + bscale * view.getFloat32(4 * i, false);
      return;
    case -64:
      for (let i = 0; i < count; i++) out[i] = bzero + bscale * view.getFloat64(8 * i, false);
      return;
  }
}
