import { InputError } from '../errors.js';
import type { Bitpix } from './bitpix.js';
import { decodePixels } from './decodePixels.js';
import type { FitsHeader } from './header.js';
import { readFileBytes } from '../io/readFileBytes.js';
import { pixelScaleFromHeader, type PixelScale } from './pixelScale.js';
import { iterateHdus, type FitsHduInfo } from './scanHdus.js';

/**
 * A 2-D image read from a FITS file. `data` holds physical values (BSCALE and BZERO applied,
 * BLANK pixels NaN) in row-major order: index i + nx * j is column i (along NAXIS1) of row j,
 * and row j = 0 is the first row stored, the bottom row in arcsift's convention.
 */
export interface FitsImage {
  readonly data: Float64Array;
  /** Columns, NAXIS1. */
  readonly nx: number;
  /** Rows, NAXIS2. */
  readonly ny: number;
  /** How the values were stored. */
  readonly bitpix: Bitpix;
  readonly header: FitsHeader;
  /** 0 for the primary HDU, then 1, 2, ... for extensions. */
  readonly hduIndex: number;
  readonly extname?: string;
  /** The primary HDU's header when the image is in an extension (pipelines keep EXPTIME and the like there). */
  readonly primaryHeader?: FitsHeader;
  /** From CDi_j, PCi_j or CDELTi when the header has them; check `square` before using it. */
  readonly pixelScale?: PixelScale;
}

/** Which HDU to read. */
export interface FitsImageSelection {
  /** HDU index (0 = primary) or EXTNAME (matched without regard to case or trailing blanks). Default: the first HDU holding a 2-D image. */
  readonly hdu?: number | string;
  /** With an EXTNAME, the EXTVER that must match too (an HDU without EXTVER counts as EXTVER 1). */
  readonly extver?: number;
}

function describeHdu(hdu: FitsHduInfo): string {
  const name = hdu.extname === undefined ? '' : ` EXTNAME='${hdu.extname}'`;
  return `HDU ${hdu.index} (${hdu.type}${name}, NAXIS=${hdu.axisLengths.length})`;
}

/**
 * [nx, ny] when the HDU holds a 2-D image: the primary array or an IMAGE extension with
 * NAXIS = 2 (further axes of length 1 are accepted as common practice), or why it does not.
 */
function imageShape(hdu: FitsHduInfo): readonly [number, number] | string {
  if (hdu.type !== 'PRIMARY' && hdu.type !== 'IMAGE') return `${describeHdu(hdu)} is a ${hdu.type} extension, not an image`;
  if (hdu.type === 'PRIMARY' && hdu.axisLengths[0] === 0 && hdu.header.getLogical('GROUPS') === true) {
    return `${describeHdu(hdu)} holds random groups, not an image`;
  }
  const axes = hdu.axisLengths;
  const extra = axes.slice(2);
  if (axes.length < 2 || extra.some((length) => length !== 1)) {
    const lengths = axes.map((length, n) => `NAXIS${n + 1}=${length}`).join(', ');
    return `${describeHdu(hdu)} is not a 2-D image: expected NAXIS = 2, found NAXIS = ${axes.length}${lengths === '' ? '' : ` (${lengths})`}`;
  }
  if (axes[0] === 0 || axes[1] === 0) return `${describeHdu(hdu)} is an empty image (NAXIS1=${axes[0]}, NAXIS2=${axes[1]})`;
  return [axes[0], axes[1]];
}

function namesMatch(hdu: FitsHduInfo, name: string, extver: number | undefined): boolean {
  if (hdu.extname === undefined || hdu.extname.trimEnd().toUpperCase() !== name.trimEnd().toUpperCase()) return false;
  return extver === undefined || (hdu.extver ?? 1) === extver;
}

function selectHdu(bytes: Uint8Array, selection: FitsImageSelection, source: string | undefined): { hdu: FitsHduInfo; primary: FitsHduInfo } {
  const wanted = selection.hdu;
  if (typeof wanted === 'number' && !(Number.isInteger(wanted) && wanted >= 0)) {
    throw new InputError(`HDU not found: expected an HDU index 0, 1, 2, ..., found ${wanted}`, { file: source });
  }
  const seen: FitsHduInfo[] = [];
  for (const hdu of iterateHdus(bytes, source)) {
    seen.push(hdu);
    if (wanted === undefined ? typeof imageShape(hdu) !== 'string' : typeof wanted === 'number' ? hdu.index === wanted : namesMatch(hdu, wanted, selection.extver)) {
      return { hdu, primary: seen[0] };
    }
  }
  const contents = seen.map(describeHdu).join(', ');
  if (wanted === undefined) throw new InputError(`HDU not found: no HDU holds a 2-D image; the file has ${contents}`, { file: source });
  if (typeof wanted === 'number') {
    throw new InputError(`HDU not found: HDU ${wanted} was asked for, but the file has ${seen.length} HDUs (${contents})`, { file: source });
  }
  const version = selection.extver === undefined ? '' : ` with EXTVER=${selection.extver}`;
  throw new InputError(`HDU not found: no HDU has EXTNAME='${wanted}'${version}; the file has ${contents}`, { file: source });
}

/** A 2-D image from the bytes of a FITS file; `source` names the file in error messages. */
export function decodeFitsImage(bytes: Uint8Array, selection: FitsImageSelection = {}, source?: string): FitsImage {
  const { hdu, primary } = selectHdu(bytes, selection, source);
  const shape = imageShape(hdu);
  if (typeof shape === 'string') throw new InputError(shape, { file: source });
  const [nx, ny] = shape;
  const { header, bitpix } = hdu;
  const bscale = header.getNumber('BSCALE') ?? 1;
  const bzero = header.getNumber('BZERO') ?? 0;
  const blank = bitpix > 0 ? header.getInteger('BLANK') : undefined;
  const data = new Float64Array(nx * ny);
  decodePixels(bytes, hdu.dataOffset, nx * ny, bitpix, bscale, bzero, blank, data);
  const pixelScale = pixelScaleFromHeader(header);
  return {
    data,
    nx,
    ny,
    bitpix,
    header,
    hduIndex: hdu.index,
    ...(hdu.extname !== undefined ? { extname: hdu.extname } : {}),
    ...(hdu.index > 0 ? { primaryHeader: primary.header } : {}),
    ...(pixelScale !== undefined ? { pixelScale } : {}),
  };
}

/** A 2-D image from a FITS file on disk. */
export function readFitsImage(path: string, selection: FitsImageSelection = {}): FitsImage {
  return decodeFitsImage(readFileBytes(path), selection, path);
}
