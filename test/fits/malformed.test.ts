import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { decodeFitsImage, readFileBytes, readFitsImage, type FitsImageSelection } from '../../src/fits/index.js';
import { concatBytes, dataBytes, headerBytes, thrown } from './fitsTestBytes.js';

const FILE = 'bad.fits';
const FIXTURES = join(import.meta.dirname, '..', 'fixtures', 'fits');

/** A primary header typed in by hand (FITS Standard 4.0 sec. 4.4.1.1) with the given BITPIX and axes. */
function primary(bitpix: string, axes: readonly number[], extra: readonly string[] = [], end = true): Uint8Array {
  return headerBytes([
    'SIMPLE  =                    T',
    `BITPIX  = ${bitpix.padStart(20)}`,
    `NAXIS   = ${String(axes.length).padStart(20)}`,
    ...axes.map((length, n) => `NAXIS${n + 1}`.padEnd(8) + `= ${String(length).padStart(20)}`),
    ...extra,
    ...(end ? ['END'] : []),
  ]);
}

/** A valid 3 x 2 16-bit image: one header block and one data block. */
const valid = concatBytes(primary('16', [3, 2]), dataBytes([0, 1, 0, 2, 0, 3, 0, 4, 0, 5, 0, 6]));

/** The InputError reading `bytes` throws; its message must open with the file name. */
function rejection(bytes: Uint8Array, selection: FitsImageSelection = {}): string {
  const error = thrown(() => decodeFitsImage(bytes, selection, FILE));
  expect(error).toBeInstanceOf(InputError);
  expect(error.message.startsWith(`${FILE}`)).toBe(true);
  return error.message;
}

describe('malformed FITS input is an InputError naming the file and the problem', () => {
  it('the valid file used below reads', () => {
    expect(Array.from(decodeFitsImage(valid).data)).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it('garbage, text and empty files are not FITS files (no SIMPLE card)', () => {
    let state = 12345;
    // A fixed linear congruential sequence (Numerical Recipes' ranqd1 constants) so the garbage is the same each run.
    const garbage = Uint8Array.from({ length: 5760 }, () => {
      state = (1664525 * state + 1013904223) >>> 0;
      return state >>> 24;
    });
    for (const bytes of [garbage, new TextEncoder().encode('just some text\n'), new Uint8Array(0)]) {
      expect(rejection(bytes)).toMatch(/not a FITS file.*SIMPLE/);
    }
    expect(rejection(primary('16', [3, 2]).map((byte, i) => (i === 29 ? 0x46 : byte)))).toMatch(/SIMPLE = F/);
  });

  it('a header cut short is a truncated header', () => {
    expect(rejection(valid.subarray(0, 300))).toMatch(/truncated header: HDU 0 .*ends 300 bytes later.*before any END/);
    // END is there but the file stops inside the header block: the data cannot be there either.
    expect(rejection(valid.subarray(0, 1000))).toMatch(/truncated data: HDU 0 .*the file has 0 bytes there \(file size 1000\)/);
  });

  it('a header without END is rejected whether the file ends or data follows', () => {
    expect(rejection(primary('16', [3, 2], [], false))).toMatch(/missing END card: the header of HDU 0 .*36 cards/);
    const withData = concatBytes(primary('16', [3, 2], [], false), dataBytes([0, 1, 0, 2, 0, 3]));
    expect(rejection(withData)).toMatch(/header card 37 of HDU 0 .*not printable ASCII.*missing its END card/);
  });

  it('data shorter than NAXIS1 x NAXIS2 x |BITPIX|/8 is truncated data, with the sizes', () => {
    expect(rejection(valid.subarray(0, 2880 + 5))).toMatch(
      /truncated data: HDU 0 needs 12 bytes of data \(NAXIS1=3 x NAXIS2=2 x \|BITPIX\|\/8=2\) from byte 2880, but the file has 5 bytes there/,
    );
    // A BINTABLE cut short is found while skipping it on the way to the image behind it (its size includes PCOUNT).
    const extensions = readFileBytes(join(FIXTURES, 'extensions.fits'));
    expect(rejection(extensions.subarray(0, 2 * 2880 + 50), { hdu: 'SCI' })).toMatch(/truncated data: HDU 1 needs 112 bytes .*PCOUNT=64, GCOUNT=1/);
    // Cut inside the header that follows it: that header is truncated.
    expect(rejection(extensions.subarray(0, 3 * 2880 + 100), { hdu: 'SCI' })).toMatch(/truncated header: HDU 2/);
  });

  it('a BITPIX outside 8, 16, 32, 64, -32, -64 is bad', () => {
    expect(rejection(concatBytes(primary('12', [3, 2]), dataBytes([])))).toMatch(/key BITPIX: bad BITPIX .*found 12/);
    expect(rejection(concatBytes(primary("'16'", [3, 2]), dataBytes([])))).toMatch(/key BITPIX: header value expected an integer, found the string '16'/);
  });

  it('an HDU asked for that is not a 2-D image is rejected with its NAXIS', () => {
    const cube = concatBytes(primary('8', [3, 2, 4]), dataBytes(new Array(24).fill(1)));
    expect(rejection(cube, { hdu: 0 })).toMatch(/HDU 0 \(PRIMARY, NAXIS=3\) is not a 2-D image: expected NAXIS = 2, found NAXIS = 3 \(NAXIS1=3, NAXIS2=2, NAXIS3=4\)/);
    expect(rejection(cube)).toMatch(/HDU not found: no HDU holds a 2-D image; the file has HDU 0 \(PRIMARY, NAXIS=3\)/);
    const line = concatBytes(primary('8', [6]), dataBytes(new Array(6).fill(1)));
    expect(rejection(line, { hdu: 0 })).toMatch(/found NAXIS = 1/);
    // Further axes of length 1 hold a 2-D image (common practice, e.g. radio images with one frequency).
    const flat = concatBytes(primary('8', [3, 2, 1]), dataBytes([1, 2, 3, 4, 5, 6]));
    expect(Array.from(decodeFitsImage(flat).data)).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it('an HDU that is not there, or not an image, is reported with what the file holds', () => {
    const extensions = readFileBytes(join(FIXTURES, 'extensions.fits'));
    expect(rejection(extensions, { hdu: 7 })).toMatch(/HDU not found: HDU 7 was asked for, but the file has 5 HDUs .*HDU 1 \(BINTABLE EXTNAME='CATALOG'/);
    expect(rejection(extensions, { hdu: 'NOPE' })).toMatch(/HDU not found: no HDU has EXTNAME='NOPE'/);
    expect(rejection(extensions, { hdu: 'SCI', extver: 3 })).toMatch(/EXTNAME='SCI' with EXTVER=3/);
    expect(rejection(extensions, { hdu: 'CATALOG' })).toMatch(/HDU 1 .* is a BINTABLE extension, not an image/);
    expect(rejection(extensions, { hdu: -1 })).toMatch(/expected an HDU index/);
  });

  it('an unreadable card is named by its number and text', () => {
    const bytes = concatBytes(primary('16', [3, 2], ['GAIN    = lots / e/ADU']), dataBytes(new Array(12).fill(0)));
    expect(rejection(bytes)).toMatch(/bad\.fits, key GAIN: unreadable header card 6 of HDU 0: value "lots" is not .*"GAIN    = lots \/ e\/ADU"/);
  });

  it('a file that cannot be opened is an InputError naming it', () => {
    const path = join(FIXTURES, 'no-such-file.fits');
    const error = thrown(() => readFitsImage(path));
    expect(error).toBeInstanceOf(InputError);
    expect(error.message).toMatch(/no-such-file\.fits: cannot read the file: ENOENT/);
  });
});
