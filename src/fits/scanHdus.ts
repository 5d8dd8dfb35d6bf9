import { InputError } from '../errors.js';
import { requireBitpix, type Bitpix } from './bitpix.js';
import { FITS_CARD_BYTES, paddedToBlock } from './fitsBlock.js';
import type { FitsHeader } from './header.js';
import { parseHeader } from './parseHeader.js';

/** Where one header-and-data unit sits in a file and what its mandatory keywords say. */
export interface FitsHduInfo {
  /** 0 for the primary HDU, then 1, 2, ... for the extensions in file order. */
  readonly index: number;
  /** 'PRIMARY', or the XTENSION value without trailing blanks ('IMAGE', 'BINTABLE', 'TABLE', ...). */
  readonly type: string;
  readonly header: FitsHeader;
  readonly bitpix: Bitpix;
  /** NAXIS1 ... NAXISn; NAXIS1 is the fastest-varying axis in the data. */
  readonly axisLengths: readonly number[];
  readonly extname?: string;
  readonly extver?: number;
  readonly headerOffset: number;
  readonly dataOffset: number;
  /** Data bytes without the padding to the next block. */
  readonly dataByteLength: number;
}

function startsWith(bytes: Uint8Array, offset: number, text: string): boolean {
  if (offset + text.length > bytes.length) return false;
  for (let i = 0; i < text.length; i++) if (bytes[offset + i] !== text.charCodeAt(i)) return false;
  return true;
}

function nonNegativeInteger(header: FitsHeader, keyword: string, hduIndex: number, fallback?: number): number {
  const value = fallback !== undefined && !header.has(keyword) ? fallback : header.requireInteger(keyword);
  if (value < 0) {
    throw new InputError(`HDU ${hduIndex} header: expected a non-negative integer, found ${value}`, { file: header.source, key: keyword });
  }
  return value;
}

function hduType(header: FitsHeader, index: number): string {
  const first = header.cards[0];
  if (index === 0) {
    if (first === undefined || first.keyword !== 'SIMPLE' || first.kind !== 'logical') {
      throw new InputError('not a FITS file: the first header card is not SIMPLE = T', { file: header.source });
    }
    if (!first.value) {
      throw new InputError('not a standard FITS file: SIMPLE = F says the file does not conform to the FITS Standard', { file: header.source, key: 'SIMPLE' });
    }
    return 'PRIMARY';
  }
  if (first === undefined || first.keyword !== 'XTENSION' || first.kind !== 'string') {
    throw new InputError(`HDU ${index}: the first header card is not XTENSION = '<type>'`, { file: header.source });
  }
  return first.value.trimEnd();
}

/**
 * Reads the header at `offset` and works out the data size, FITS Standard 4.0 sec. 4.4.1.1
 * (primary), 7.1 (extensions) and 6 (random groups): |BITPIX| x GCOUNT x (PCOUNT + NAXIS1 x ...
 * x NAXISn) / 8 bytes, NAXIS1 left out of the product for random groups. Throws InputError
 * when the file is too short for that data.
 */
function readHduAt(bytes: Uint8Array, offset: number, index: number, source: string | undefined): FitsHduInfo {
  const { header, byteLength } = parseHeader(bytes, offset, source, index);
  const type = hduType(header, index);
  const bitpix = requireBitpix(header.getInteger('BITPIX'), source, `the header of HDU ${index}`);
  const naxis = nonNegativeInteger(header, 'NAXIS', index);
  if (naxis > 999) {
    throw new InputError(`HDU ${index} header: expected NAXIS from 0 to 999, found ${naxis}`, { file: source, key: 'NAXIS' });
  }
  const axisLengths: number[] = [];
  for (let n = 1; n <= naxis; n++) axisLengths.push(nonNegativeInteger(header, `NAXIS${n}`, index));
  const randomGroups = index === 0 && naxis > 0 && axisLengths[0] === 0 && header.getLogical('GROUPS') === true;
  const extension = index > 0;
  const pcount = extension || randomGroups ? nonNegativeInteger(header, 'PCOUNT', index, extension ? undefined : 0) : 0;
  const gcount = extension || randomGroups ? nonNegativeInteger(header, 'GCOUNT', index, extension ? undefined : 1) : 1;
  const counted = randomGroups ? axisLengths.slice(1) : axisLengths;
  const elements = naxis === 0 ? 0 : counted.reduce((product, length) => product * length, 1);
  const dataByteLength = (Math.abs(bitpix) / 8) * gcount * (pcount + elements);
  const dataOffset = offset + byteLength;
  if (dataOffset + dataByteLength > bytes.length) {
    const axes = axisLengths.map((length, n) => `NAXIS${n + 1}=${length}`).join(' x ');
    const extra = pcount !== 0 || gcount !== 1 ? ` with PCOUNT=${pcount}, GCOUNT=${gcount}` : '';
    throw new InputError(
      `truncated data: HDU ${index} needs ${dataByteLength} bytes of data (${axes} x |BITPIX|/8=${Math.abs(bitpix) / 8}${extra}) from byte ${dataOffset}, but the file has ${Math.max(0, bytes.length - dataOffset)} bytes there (file size ${bytes.length})`,
      { file: source },
    );
  }
  const extname = header.getString('EXTNAME');
  const extver = header.getInteger('EXTVER');
  return {
    index,
    type,
    header,
    bitpix,
    axisLengths,
    ...(extname !== undefined ? { extname } : {}),
    ...(extver !== undefined ? { extver } : {}),
    headerOffset: offset,
    dataOffset,
    dataByteLength,
  };
}

/**
 * The HDUs of a FITS file, read one at a time so that a caller who stops early never reads the
 * rest. After the last HDU, bytes that do not open with an XTENSION card are ignored (common
 * practice: some writers leave trailing blocks).
 */
export function* iterateHdus(bytes: Uint8Array, source?: string): Generator<FitsHduInfo> {
  if (!startsWith(bytes, 0, 'SIMPLE  =')) {
    throw new InputError('not a FITS file: it does not begin with the card SIMPLE  = T (FITS Standard 4.0 sec. 4.4.1.1)', { file: source });
  }
  let offset = 0;
  for (let index = 0; ; index++) {
    const hdu = readHduAt(bytes, offset, index, source);
    yield hdu;
    offset = hdu.dataOffset + paddedToBlock(hdu.dataByteLength);
    if (offset + FITS_CARD_BYTES > bytes.length || !startsWith(bytes, offset, 'XTENSION')) return;
  }
}

/** Every HDU of a FITS file. */
export function listHdus(bytes: Uint8Array, source?: string): FitsHduInfo[] {
  return [...iterateHdus(bytes, source)];
}
