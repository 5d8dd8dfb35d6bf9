import { InputError } from '../errors.js';
import { writeFileAtomic } from '../io/writeFileAtomic.js';
import { bytesPerValue, requireBitpix, type Bitpix } from './bitpix.js';
import { encodePixels } from './encodePixels.js';
import { paddedToBlock } from './fitsBlock.js';
import { formatHeader } from './formatHeader.js';
import { floatCard, integerCard, logicalCard, stringCard, type HeaderCard } from './headerCard.js';

/** A 2-D image to write, as physical values in the same layout `FitsImage.data` has. */
export interface FitsImageHdu {
  /** nx * ny values, index i + nx * j for column i of row j; row 0 is written first. */
  readonly data: Float64Array;
  readonly nx: number;
  readonly ny: number;
  /** Default -64. */
  readonly bitpix?: Bitpix;
  /** Integer types only: stored = round((value - bzero) / bscale). */
  readonly bscale?: number;
  readonly bzero?: number;
  /** Integer types only: the stored integer that NaN values become. */
  readonly blank?: number;
  readonly extname?: string;
  /** Further cards, written in order after the structural ones. */
  readonly cards?: readonly HeaderCard[];
}

/** A primary HDU without data, for files whose images are all in extensions. */
export interface FitsHeaderOnlyHdu {
  readonly cards?: readonly HeaderCard[];
}

export interface FitsFileContent {
  readonly primary: FitsImageHdu | FitsHeaderOnlyHdu;
  /** Written as IMAGE extensions after the primary HDU. */
  readonly extensions?: readonly FitsImageHdu[];
}

const STRUCTURAL_PATTERN = /^(SIMPLE|XTENSION|BITPIX|NAXIS\d*|PCOUNT|GCOUNT|EXTEND|GROUPS|END|CONTINUE|BSCALE|BZERO|BLANK|EXTNAME)$/;

/**
 * Keywords the writer sets itself from the image and its options, so they may not be among the
 * caller's cards: the mandatory keywords (FITS Standard 4.0 sec. 4.4.1), EXTEND, GROUPS, the
 * scaling keywords BSCALE, BZERO, BLANK, and EXTNAME, END and CONTINUE.
 */
export function isStructuralKeyword(keyword: string): boolean {
  return STRUCTURAL_PATTERN.test(keyword.toUpperCase());
}

/** True for an HDU with an image, false for a header alone. */
export function isImageHdu(hdu: FitsImageHdu | FitsHeaderOnlyHdu): hdu is FitsImageHdu {
  return 'data' in hdu;
}

function numberCard(keyword: string, value: number): HeaderCard {
  return Number.isInteger(value) ? integerCard(keyword, value) : floatCard(keyword, value);
}

function checkImage(hdu: FitsImageHdu, where: string, source: string | undefined): Bitpix {
  const fail = (key: string, problem: string): never => {
    throw new InputError(`cannot write ${where}: ${problem}`, { file: source, key });
  };
  const bitpix = requireBitpix(hdu.bitpix ?? -64, source, where);
  if (!(Number.isInteger(hdu.nx) && hdu.nx > 0)) fail('NAXIS1', `expected a positive whole number of columns, found ${hdu.nx}`);
  if (!(Number.isInteger(hdu.ny) && hdu.ny > 0)) fail('NAXIS2', `expected a positive whole number of rows, found ${hdu.ny}`);
  if (hdu.data.length !== hdu.nx * hdu.ny) {
    fail('NAXIS1', `expected ${hdu.nx} x ${hdu.ny} = ${hdu.nx * hdu.ny} values, found ${hdu.data.length}`);
  }
  if (bitpix < 0) {
    for (const key of ['bscale', 'bzero', 'blank'] as const) {
      if (hdu[key] !== undefined) fail(key.toUpperCase(), `${key} applies to integer BITPIX only, found BITPIX ${bitpix}`);
    }
  }
  if (hdu.bscale !== undefined && !(Number.isFinite(hdu.bscale) && hdu.bscale !== 0)) {
    fail('BSCALE', `expected a finite non-zero number, found ${hdu.bscale}`);
  }
  if (hdu.bzero !== undefined && !Number.isFinite(hdu.bzero)) fail('BZERO', `expected a finite number, found ${hdu.bzero}`);
  if (hdu.blank !== undefined) {
    const highest = 2 ** (bitpix - 1);
    const range = bitpix === 8 ? [0, 255] : [-highest, highest - 1];
    if (!(Number.isInteger(hdu.blank) && hdu.blank >= range[0] && hdu.blank <= range[1])) {
      fail('BLANK', `expected an integer from ${range[0]} to ${range[1]} for BITPIX ${bitpix}, found ${hdu.blank}`);
    }
  }
  checkCards(hdu.cards, where, source);
  return bitpix;
}

function checkCards(cards: readonly HeaderCard[] | undefined, where: string, source: string | undefined): void {
  for (const card of cards ?? []) {
    if (isStructuralKeyword(card.keyword)) {
      throw new InputError(`cannot write ${where}: this keyword is written from the image and its options; leave it out of the cards`, {
        file: source,
        key: card.keyword,
      });
    }
  }
}

/** Header cards in the order of FITS Standard 4.0 sec. 4.4.1.1 (primary) and 7.1.1 (IMAGE extension). */
function structuralCards(hdu: FitsImageHdu | FitsHeaderOnlyHdu, bitpix: Bitpix, primary: boolean, hasExtensions: boolean): HeaderCard[] {
  const cards: HeaderCard[] = [primary ? logicalCard('SIMPLE', true) : stringCard('XTENSION', 'IMAGE'), integerCard('BITPIX', bitpix)];
  if (isImageHdu(hdu)) cards.push(integerCard('NAXIS', 2), integerCard('NAXIS1', hdu.nx), integerCard('NAXIS2', hdu.ny));
  else cards.push(integerCard('NAXIS', 0));
  if (primary && hasExtensions) cards.push(logicalCard('EXTEND', true));
  if (!primary) cards.push(integerCard('PCOUNT', 0), integerCard('GCOUNT', 1));
  if (isImageHdu(hdu)) {
    if (hdu.bscale !== undefined) cards.push(numberCard('BSCALE', hdu.bscale));
    if (hdu.bzero !== undefined) cards.push(numberCard('BZERO', hdu.bzero));
    if (hdu.blank !== undefined) cards.push(integerCard('BLANK', hdu.blank));
    if (hdu.extname !== undefined) cards.push(stringCard('EXTNAME', hdu.extname));
  }
  return cards;
}

function encodeHdu(hdu: FitsImageHdu | FitsHeaderOnlyHdu, index: number, hasExtensions: boolean, source: string | undefined): Uint8Array[] {
  const where = index === 0 ? 'the primary HDU' : `extension ${index}`;
  if (!isImageHdu(hdu)) {
    checkCards(hdu.cards, where, source);
    return [formatHeader([...structuralCards(hdu, 8, true, hasExtensions), ...(hdu.cards ?? [])], source)];
  }
  const bitpix = checkImage(hdu, where, source);
  const header = formatHeader([...structuralCards(hdu, bitpix, index === 0, hasExtensions), ...(hdu.cards ?? [])], source);
  const data = new Uint8Array(paddedToBlock(hdu.data.length * bytesPerValue(bitpix)));
  encodePixels(hdu.data, { bitpix, bscale: hdu.bscale ?? 1, bzero: hdu.bzero ?? 0, blank: hdu.blank, nx: hdu.nx, source }, data, 0);
  return [header, data];
}

/**
 * The bytes of a FITS file: a primary HDU (an image, or a header alone) and IMAGE extensions,
 * each header padded with blanks and each data block with zeros to 2880 bytes (FITS Standard
 * 4.0 sec. 3.3). `source` names the file in error messages.
 */
export function encodeFits(content: FitsFileContent, source?: string): Uint8Array {
  const extensions = content.extensions ?? [];
  const parts = [content.primary, ...extensions].flatMap((hdu, index) => encodeHdu(hdu, index, extensions.length > 0, source));
  const bytes = new Uint8Array(parts.reduce((total, part) => total + part.length, 0));
  let offset = 0;
  for (const part of parts) {
    bytes.set(part, offset);
    offset += part.length;
  }
  return bytes;
}

/** Writes a FITS file atomically (temporary name, then rename). */
export function writeFits(path: string, content: FitsFileContent): void {
  writeFileAtomic(path, encodeFits(content, path));
}

/** Writes one image as the primary HDU of a FITS file. */
export function writeFitsImage(path: string, image: FitsImageHdu): void {
  writeFits(path, { primary: image });
}
