import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  blankKeywordCard,
  commentCard,
  complexFloatCard,
  complexIntegerCard,
  floatCard,
  historyCard,
  integerCard,
  isImageHdu,
  logicalCard,
  readFitsImage,
  requireSquarePixelScaleArcsec,
  stringCard,
  undefinedCard,
  writeFits,
  type Bitpix,
  type FitsFileContent,
  type FitsImageHdu,
  type HeaderCard,
} from '../../src/fits/index.js';

// Fixtures written by an outside writer, astropy.io.fits (Debian's python3-astropy), with
// test/fixtures/fits/make_fixtures.py; expected.json holds what astropy itself reads back from them.
const FIXTURES = join(import.meta.dirname, '..', 'fixtures', 'fits');
const SCRIPT = join(FIXTURES, 'make_fixtures.py');
const PYTHON = '/usr/bin/python3';

type JsonNumber = number | 'NaN' | 'Infinity' | '-Infinity';

interface ExpectedCard {
  readonly keyword: string;
  readonly kind: string;
  readonly value?: unknown;
  readonly comment?: string;
  readonly text?: string;
}

interface ExpectedHdu {
  readonly index: number;
  readonly bitpix: Bitpix;
  readonly nx: number;
  readonly ny: number;
  readonly extname: string | null;
  readonly extver?: number | null;
  readonly data: readonly JsonNumber[];
  readonly cards?: readonly ExpectedCard[];
  readonly pixelScale?: { pixelScaleArcsec: number; axis1Arcsec: number; axis2Arcsec: number; skewCosine: number };
}

interface ExpectedFile {
  readonly file: string;
  readonly hdus: readonly ExpectedHdu[];
  readonly nonImageHdus?: readonly { index: number; type: string }[];
}

const expected = JSON.parse(readFileSync(join(FIXTURES, 'expected.json'), 'utf8')) as { files: ExpectedFile[] };

function fromJson(value: JsonNumber): number {
  return typeof value === 'number' ? value : Number(value);
}

function toJson(value: number): JsonNumber {
  if (Number.isNaN(value)) return 'NaN';
  if (value === Infinity) return 'Infinity';
  if (value === -Infinity) return '-Infinity';
  return value;
}

/** The fields of an arcsift card in the shape expected.json uses, astropy's 'complex' for both complex kinds. */
function cardAsJson(card: HeaderCard, complexKind: (kind: string) => string): ExpectedCard {
  if (card.kind === 'commentary') return { keyword: card.keyword, kind: 'commentary', text: card.text };
  const entry: { keyword: string; kind: string; value?: unknown; comment?: string } = { keyword: card.keyword, kind: card.kind };
  if (card.kind === 'complexInteger' || card.kind === 'complexFloat') {
    entry.kind = complexKind(card.kind);
    entry.value = [card.value.re, card.value.im];
  } else if (card.kind !== 'undefined') {
    entry.value = card.value;
  }
  if (card.comment !== undefined) entry.comment = card.comment;
  return entry;
}

describe('reading FITS files written by astropy.io.fits', () => {
  for (const file of expected.files) {
    for (const hdu of file.hdus) {
      it(`${file.file} HDU ${hdu.index}${hdu.extname === null ? '' : ` (${hdu.extname})`}`, () => {
        const image = readFitsImage(join(FIXTURES, file.file), { hdu: hdu.index });
        expect([image.nx, image.ny, image.bitpix, image.hduIndex]).toEqual([hdu.nx, hdu.ny, hdu.bitpix, hdu.index]);
        expect(image.extname ?? null).toBe(hdu.extname);
        // Exact: astropy's values are the stored numbers (scaled exactly, which make_fixtures.py checks), and so are ours.
        expect(Array.from(image.data)).toEqual(hdu.data.map(fromJson));
        if (hdu.cards !== undefined) {
          expect(image.header.cards.map((card) => cardAsJson(card, () => 'complex'))).toEqual(hdu.cards);
        }
        if (hdu.pixelScale !== undefined) {
          // astropy.wcs works in double precision from the same keywords; 1e-12 relative allows for the order of operations.
          const ours = image.pixelScale;
          expect(ours).toBeDefined();
          for (const key of ['pixelScaleArcsec', 'axis1Arcsec', 'axis2Arcsec'] as const) {
            expect(Math.abs(ours![key] - hdu.pixelScale[key])).toBeLessThan(1e-12 * hdu.pixelScale[key]);
          }
          expect(Math.abs(ours!.skewCosine - hdu.pixelScale.skewCosine)).toBeLessThan(1e-12);
        }
      });
    }
  }

  it('extensions.fits: skips the empty primary, the BINTABLE (PCOUNT > 0) and the TABLE by their sizes', () => {
    const path = join(FIXTURES, 'extensions.fits');
    expect(readFitsImage(path).hduIndex).toBe(3);
    expect(readFitsImage(path, { hdu: 'sci' }).hduIndex).toBe(3);
    expect(readFitsImage(path, { hdu: 'SCI', extver: 2 }).hduIndex).toBe(4);
    const file = expected.files.find((entry) => entry.file === 'extensions.fits')!;
    for (const { index, type } of file.nonImageHdus!) {
      expect(() => readFitsImage(path, { hdu: index })).toThrow(index === 0 ? /not a 2-D image.*NAXIS = 0/ : new RegExp(`is a ${type} extension`));
    }
  });

  it('cards.fits: the complex integer and complex float keep their kinds, the D exponent reads as a float', () => {
    const header = readFitsImage(join(FIXTURES, 'cards.fits')).header;
    expect(header.find('CPLXI')?.kind).toBe('complexInteger');
    expect(header.find('CPLXF')?.kind).toBe('complexFloat');
    expect(header.find('DEXP')).toEqual({ keyword: 'DEXP', kind: 'float', value: 1.5e-3, comment: 'a double-precision exponent' });
  });

  it('wcs.fits: square pixels from CD, CDELT and PC; the 1.2:1 CD matrix is reported as not square', () => {
    const path = join(FIXTURES, 'wcs.fits');
    expect(readFitsImage(path, { hdu: 0 }).pixelScale).toMatchObject({ from: 'CD', square: true });
    expect(readFitsImage(path, { hdu: 'CDELT' }).pixelScale).toMatchObject({ from: 'CDELT', square: true });
    expect(readFitsImage(path, { hdu: 'PC' }).pixelScale).toMatchObject({ from: 'PC', square: true });
    const nonSquare = readFitsImage(path, { hdu: 'NONSQUARE' });
    expect(nonSquare.pixelScale).toMatchObject({ from: 'CD', square: false });
    expect(nonSquare.pixelScale?.problem).toMatch(/steps along NAXIS1 \(0\.0[45]\d* arcsec\) and NAXIS2 \(0\.0[56]\d* arcsec\) differ/);
    expect(() => requireSquarePixelScaleArcsec(nonSquare.header)).toThrow(/wcs\.fits, key CD1_1: pixels are not square/);
  });
});

// Files arcsift writes, to be read by astropy with make_fixtures.py --check.
const cards: readonly HeaderCard[] = [
  logicalCard('LOGICT', true, 'a logical'),
  logicalCard('LOGICF', false),
  integerCard('INTVAL', -42, 'an integer'),
  floatCard('FLTVAL', 6.02214076e23, 'a float'),
  floatCard('FLTTINY', -1.25e-7),
  stringCard('QUOTED', "O'HARA", 'doubled quote'),
  stringCard('LEADING', '  leading blanks'),
  stringCard('NULLSTR', ''),
  stringCard('LONGSTR', `${'A long string value, '.repeat(8)}with a quote (') near the end.`, 'comment on a long string'),
  complexIntegerCard('CPLXI', 3, -4, 'complex integer'),
  complexFloatCard('CPLXF', 1.5, -2.25, 'complex float'),
  undefinedCard('UNDEF', 'no value'),
  commentCard('a comment card'),
  historyCard('a history card'),
  blankKeywordCard('a blank-keyword card'),
];

function ramp(length: number, map: (i: number) => number): Float64Array {
  return Float64Array.from({ length }, (_, i) => map(i));
}

const written: Readonly<Record<string, FitsFileContent>> = {
  'arcsift8.fits': { primary: { data: ramp(15, (i) => [0, 255, 128][i % 3] + (i % 3 === 2 ? i : 0)), nx: 5, ny: 3, bitpix: 8 } },
  'arcsift16.fits': { primary: { data: ramp(15, (i) => (i === 0 ? -32768 : i === 1 ? 32767 : i * 101 - 700)), nx: 5, ny: 3, bitpix: 16 } },
  'arcsift32.fits': { primary: { data: ramp(15, (i) => (i === 0 ? -2147483648 : i === 1 ? 2147483647 : i * 1e6 - 7)), nx: 5, ny: 3, bitpix: 32 } },
  'arcsift64.fits': { primary: { data: ramp(15, (i) => (i === 0 ? -(2 ** 63) : i === 1 ? 2 ** 53 : i * 1e12 - 7)), nx: 5, ny: 3, bitpix: 64 } },
  'arcsift-32.fits': { primary: { data: ramp(15, (i) => (i === 3 ? Number.NaN : Math.fround(i / 7 - 1))), nx: 5, ny: 3, bitpix: -32 } },
  'arcsift-64.fits': { primary: { data: ramp(15, (i) => (i === 3 ? Number.NaN : i === 4 ? -Infinity : i / 7 - 1)), nx: 5, ny: 3, bitpix: -64, cards } },
  'arcsiftscaled.fits': { primary: { data: ramp(12, (i) => -100.5 + 0.25 * (i * 37 - 200)), nx: 4, ny: 3, bitpix: 16, bscale: 0.25, bzero: -100.5 } },
  'arcsiftuint16.fits': { primary: { data: ramp(12, (i) => [0, 65535, 32768][i % 3] + (i % 3 === 2 ? i : 0)), nx: 4, ny: 3, bitpix: 16, bzero: 32768 } },
  'arcsiftext.fits': {
    primary: { cards: [stringCard('ORIGIN', 'arcsift test')] },
    extensions: [
      { data: ramp(6, (i) => i * 0.5), nx: 3, ny: 2, bitpix: -32, extname: 'MODEL', cards },
      { data: ramp(20, (i) => i * 3 - 30), nx: 5, ny: 4, bitpix: 32, extname: 'NOISE' },
    ],
  },
};

function hduExpectation(hdu: FitsImageHdu, index: number, complexKind: (kind: string) => string): object {
  return {
    index,
    bitpix: hdu.bitpix ?? -64,
    nx: hdu.nx,
    ny: hdu.ny,
    extname: hdu.extname ?? null,
    data: Array.from(hdu.data, toJson),
    cards: (hdu.cards ?? []).map((card) => cardAsJson(card, complexKind)),
  };
}

function withOnePixelChanged(content: FitsFileContent): FitsFileContent {
  const primary = content.primary as FitsImageHdu;
  const data = primary.data.slice();
  data[7] += 1;
  return { ...content, primary: { ...primary, data } };
}

/** Writes the files and expected.json (the intended content); with `alterPixel`, arcsift16.fits is written with pixel 7 changed. */
function writeForAstropy(folder: string, alterPixel: boolean): void {
  mkdirSync(folder, { recursive: true });
  const files = Object.entries(written).map(([file, content]) => {
    writeFits(join(folder, file), alterPixel && file === 'arcsift16.fits' ? withOnePixelChanged(content) : content);
    const hdus = [content.primary, ...(content.extensions ?? [])];
    return {
      file,
      hduCount: hdus.length,
      hdus: hdus.flatMap((hdu, index) => (isImageHdu(hdu) ? [hduExpectation(hdu, index, (kind) => kind)] : [])),
    };
  });
  writeFileSync(join(folder, 'expected.json'), JSON.stringify({ files }, null, 1));
}

const astropyAvailable = spawnSync(PYTHON, ['-c', 'import astropy.io.fits, numpy'], { encoding: 'utf8' }).status === 0;
const skipNote = astropyAvailable ? '' : ` (SKIPPED: ${PYTHON} with astropy and numpy is not available)`;
if (!astropyAvailable) console.warn(`test/fits/astropy.test.ts: astropy check skipped, ${PYTHON} cannot import astropy.io.fits and numpy`);

describe("astropy reading FITS files written by arcsift (make_fixtures.py --check)", () => {
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-astropy-'));
  afterAll(() => rmSync(folder, { recursive: true, force: true }));

  it.skipIf(!astropyAvailable)(`astropy verifies every file against the standard and reads the values written${skipNote}`, () => {
    const good = join(folder, 'good');
    const bad = join(folder, 'bad');
    writeForAstropy(good, false);
    writeForAstropy(bad, true);
    const run = (path: string) => spawnSync(PYTHON, [SCRIPT, '--check', path], { encoding: 'utf8', timeout: 60_000 });
    const result = run(good);
    expect(result.stdout + result.stderr).toMatch(/checked 9 files with astropy [\d.]+: 0 problems/);
    expect(result.status).toBe(0);
    // The same check on a file with one wrong pixel fails, so the check above can fail.
    const failing = run(bad);
    expect(failing.status).toBe(1);
    expect(failing.stdout).toMatch(/arcsift16\.fits HDU 0: pixel \(column 2, row 1\)/);
  });
});
