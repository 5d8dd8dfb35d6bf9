import { InputError, expectedFound } from '../errors.js';

/** The BITPIX values of FITS Standard 4.0, Table 8: unsigned 8-bit, signed 16/32/64-bit, IEEE 32/64-bit. */
export type Bitpix = 8 | 16 | 32 | 64 | -32 | -64;

export const BITPIX_VALUES: readonly Bitpix[] = [8, 16, 32, 64, -32, -64];

export function isBitpix(value: unknown): value is Bitpix {
  return typeof value === 'number' && (BITPIX_VALUES as readonly number[]).includes(value);
}

/** Bytes per stored value: |BITPIX| / 8. */
export function bytesPerValue(bitpix: Bitpix): number {
  return Math.abs(bitpix) / 8;
}

/** Checks a BITPIX taken from a header or from a caller, naming where it came from. */
export function requireBitpix(value: unknown, source: string | undefined, where: string): Bitpix {
  if (isBitpix(value)) return value;
  throw new InputError(`bad BITPIX in ${where}: ${expectedFound('one of 8, 16, 32, 64, -32, -64', value)}`, {
    file: source,
    key: 'BITPIX',
  });
}
