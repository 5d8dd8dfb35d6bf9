import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  blankKeywordCard,
  commentCard,
  complexFloatCard,
  complexIntegerCard,
  decodeFitsImage,
  encodeFits,
  floatCard,
  historyCard,
  integerCard,
  isStructuralKeyword,
  listHdus,
  logicalCard,
  readFitsImage,
  stringCard,
  undefinedCard,
  writeFits,
  type Bitpix,
  type HeaderCard,
} from '../../src/fits/index.js';
import { thrown } from './fitsTestBytes.js';

const NX = 4;
const NY = 3;

/** Values of one case: stored integers k (or floats) turned into physical values by the case's scaling. */
interface Case {
  readonly bitpix: Bitpix;
  readonly stored: readonly number[];
  readonly bscale?: number;
  readonly bzero?: number;
}

// Each type's extremes (FITS Standard 4.0 sec. 5.2-5.3: unsigned 8-bit, two's-complement 16/32/64-bit,
// IEEE 754 single and double); float32 values are representable in single precision so they come back exactly.
const cases: readonly Case[] = [
  { bitpix: 8, stored: [0, 1, 2, 127, 128, 254, 255, 17, 34, 51, 68, 85] },
  { bitpix: 8, stored: [0, 1, 2, 127, 128, 254, 255, 17, 34, 51, 68, 85], bscale: 1, bzero: -128 },
  { bitpix: 16, stored: [-32768, -1, 0, 1, 32767, 300, -300, 7, 8, 9, 10, 11] },
  { bitpix: 16, stored: [-32768, -1, 0, 1, 32767, 300, -300, 7, 8, 9, 10, 11], bscale: 1, bzero: 32768 },
  { bitpix: 16, stored: [-32768, -1, 0, 1, 32767, 300, -300, 7, 8, 9, 10, 11], bscale: 0.125, bzero: -7.5 },
  { bitpix: 32, stored: [-2147483648, -1, 0, 1, 2147483647, 65536, -65536, 3, 4, 5, 6, 7] },
  { bitpix: 32, stored: [-2147483648, -1, 0, 1, 2147483647, 65536, -65536, 3, 4, 5, 6, 7], bscale: 2, bzero: 2147483648 },
  { bitpix: 64, stored: [-(2 ** 63), -1, 0, 1, 2 ** 53, -(2 ** 53), 2 ** 62, 3, 4, 5, 6, 7] },
  { bitpix: 64, stored: [-(2 ** 53), -1, 0, 1, 2 ** 53, 12, 13, 3, 4, 5, 6, 7], bscale: 0.5, bzero: 10 },
  { bitpix: -32, stored: [0, -0.5, 1.5, Math.fround(0.1), Math.fround(3.4e38), 2 ** -149, Number.NaN, Infinity, -Infinity, 7, 8, 9] },
  { bitpix: -64, stored: [0, -0.5, 0.1, 1 / 3, Number.MAX_VALUE, Number.MIN_VALUE, Number.NaN, Infinity, -Infinity, Math.PI, 8, 9] },
];

function physical(c: Case): Float64Array {
  return Float64Array.from(c.stored, (k) => (c.bzero ?? 0) + (c.bscale ?? 1) * k);
}

function describeCase(c: Case): string {
  return `BITPIX ${c.bitpix}${c.bscale === undefined ? '' : ` with BSCALE ${c.bscale}, BZERO ${c.bzero}`}`;
}

const everyCardType: readonly HeaderCard[] = [
  logicalCard('LOGICT', true, 'true'),
  logicalCard('LOGICF', false),
  integerCard('INTVAL', -42, 'an integer'),
  integerCard('BIGINT', Number.MAX_SAFE_INTEGER),
  floatCard('FLTVAL', 6.02214076e23, 'a float'),
  floatCard('FLTWHOLE', 3),
  floatCard('FLTTINY', -5e-324),
  stringCard('QUOTED', "it's", 'quote inside'),
  stringCard('LEADING', '   leading'),
  stringCard('NULLSTR', ''),
  stringCard('LONGSTR', `${'long '.repeat(40)}and 'quoted' to the end`, 'a comment on a long string'),
  complexIntegerCard('CPLXI', -3, 4),
  complexFloatCard('CPLXF', 0.5, -1e-10, 'complex'),
  undefinedCard('UNDEF', 'no value yet'),
  commentCard('a comment'),
  historyCard('a history line'),
  blankKeywordCard('blank keyword text'),
];

describe('writing then reading gives back what was written', () => {
  for (const c of cases) {
    it(describeCase(c), () => {
      const data = physical(c);
      const bytes = encodeFits({ primary: { data, nx: NX, ny: NY, bitpix: c.bitpix, bscale: c.bscale, bzero: c.bzero } });
      expect(bytes.length % 2880).toBe(0);
      const image = decodeFitsImage(bytes);
      expect([image.nx, image.ny, image.bitpix]).toEqual([NX, NY, c.bitpix]);
      // Exact: every value above is representable in its stored type, and the scaling steps are exact in double.
      expect(Array.from(image.data)).toEqual(Array.from(data));
      expect(image.header.getNumber('BSCALE')).toBe(c.bscale);
      expect(image.header.getNumber('BZERO')).toBe(c.bzero);
    });
  }

  it('keeps header cards of every value type, in order', () => {
    const bytes = encodeFits({ primary: { data: new Float64Array(NX * NY), nx: NX, ny: NY, cards: everyCardType } });
    const cards = decodeFitsImage(bytes).header.cards.filter((card) => !isStructuralKeyword(card.keyword));
    // Long strings come back whole; trailing blanks are not significant (sec. 4.2.1.1), so none were used.
    expect(cards).toEqual(everyCardType);
  });

  it('writes IMAGE extensions after a header-only primary and finds them by EXTNAME, index and default', () => {
    const first = { data: Float64Array.from({ length: 6 }, (_, i) => i - 2.5), nx: 3, ny: 2, bitpix: -32 as const, extname: 'MODEL' };
    const second = { data: Float64Array.from({ length: 20 }, (_, i) => i * 10), nx: 5, ny: 4, bitpix: 16 as const, extname: 'NOISE', cards: everyCardType };
    const bytes = encodeFits({ primary: { cards: [stringCard('ORIGIN', 'arcsift test')] }, extensions: [first, second] });
    expect(listHdus(bytes).map((hdu) => [hdu.index, hdu.type, hdu.extname, hdu.axisLengths])).toEqual([
      [0, 'PRIMARY', undefined, []],
      [1, 'IMAGE', 'MODEL', [3, 2]],
      [2, 'IMAGE', 'NOISE', [5, 4]],
    ]);
    expect(decodeFitsImage(bytes).extname).toBe('MODEL');
    const noise = decodeFitsImage(bytes, { hdu: 'noise' });
    expect([noise.hduIndex, noise.nx, noise.ny]).toEqual([2, 5, 4]);
    expect(Array.from(noise.data)).toEqual(Array.from(second.data));
    expect(Array.from(decodeFitsImage(bytes, { hdu: 1 }).data)).toEqual(Array.from(first.data));
    expect(noise.header.getString('LONGSTR')).toBe(`${'long '.repeat(40)}and 'quoted' to the end`);
  });

  it('stores NaN as BLANK in integer images and reads it back as NaN', () => {
    const data = Float64Array.from([1, Number.NaN, 3, 4]);
    const image = decodeFitsImage(encodeFits({ primary: { data, nx: 2, ny: 2, bitpix: 16, blank: -32768 } }));
    expect(image.header.getInteger('BLANK')).toBe(-32768);
    expect(Array.from(image.data)).toEqual([1, Number.NaN, 3, 4]);
  });

  it('rejects values an integer type cannot hold, naming the pixel', () => {
    const data = Float64Array.from([0, 1, 2, 40000]);
    const error = thrown(() => encodeFits({ primary: { data, nx: 2, ny: 2, bitpix: 16 } }, 'out.fits'));
    expect(error).toBeInstanceOf(InputError);
    expect(error.message).toMatch(/^out\.fits, pixel \(1, 1\) \(column, row, counted from 0\): .*40000.*-32768\.\.32767/);
    expect(() => encodeFits({ primary: { data: Float64Array.from([Number.NaN]), nx: 1, ny: 1, bitpix: 8 } })).toThrow(/NaN.*BLANK/);
    expect(() => encodeFits({ primary: { data: Float64Array.from([1e39]), nx: 1, ny: 1, bitpix: -32 } })).toThrow(/32-bit float/);
  });

  it('rejects inconsistent write requests with an InputError naming the keyword', () => {
    const data = new Float64Array(6);
    expect(() => encodeFits({ primary: { data, nx: 4, ny: 2 } })).toThrow(/key NAXIS1: .*4 x 2 = 8 values, found 6/);
    expect(() => encodeFits({ primary: { data, nx: 3, ny: 2, bitpix: -64, bzero: 1 } })).toThrow(/key BZERO: .*integer BITPIX only/);
    expect(() => encodeFits({ primary: { data, nx: 3, ny: 2, bitpix: 12 as Bitpix } })).toThrow(/bad BITPIX/);
    expect(() => encodeFits({ primary: { data, nx: 3, ny: 2, cards: [integerCard('NAXIS1', 3)] } })).toThrow(/key NAXIS1: .*leave it out/);
    expect(() => encodeFits({ primary: { data, nx: 3, ny: 2, bitpix: 8, blank: 300 } })).toThrow(/key BLANK/);
  });
});

describe('writing to disk', () => {
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-fits-'));
  afterAll(() => rmSync(folder, { recursive: true, force: true }));

  it('writes atomically and reads the file back', () => {
    const path = join(folder, 'sub', 'image.fits');
    const data = Float64Array.from({ length: 12 }, (_, i) => i / 8);
    writeFits(path, { primary: { data, nx: 4, ny: 3, bitpix: -64, cards: [stringCard('BUNIT', 'electron/s')] } });
    expect(readdirSync(join(folder, 'sub'))).toEqual(['image.fits']);
    const image = readFitsImage(path);
    expect(Array.from(image.data)).toEqual(Array.from(data));
    expect(image.header.source).toBe(path);
  });
});
