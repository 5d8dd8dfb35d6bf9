import { InputError } from '../errors.js';
import type { CelestialWcs } from '../fits/index.js';

/** A part of a larger frame to fit: a box of pixels, or a square about a sky position. */
export type CutoutRequest =
  | { readonly kind: 'pixels'; readonly column0: number; readonly row0: number; readonly columns: number; readonly rows: number }
  | { readonly kind: 'sky'; readonly raDeg: number; readonly decDeg: number; readonly sideArcsec: number };

/** The pixels of a frame a cut-out keeps: columns column0 .. column0 + columns - 1, rows likewise, counted from 0. */
export interface CutoutBox {
  readonly column0: number;
  readonly row0: number;
  readonly columns: number;
  readonly rows: number;
}

/** The request in words, for messages. */
export function describeCutoutRequest(request: CutoutRequest): string {
  return request.kind === 'pixels'
    ? `the box of ${request.columns} x ${request.rows} pixels from (column ${request.column0}, row ${request.row0}), counted from 0`
    : `the ${request.sideArcsec}" square about RA ${request.raDeg}, Dec ${request.decDeg} (degrees)`;
}

/**
 * The box of a cut-out inside a frame of `frameColumns` x `frameRows` pixels. A sky request
 * becomes the square of round(side / pixel scale) pixels whose centre is nearest the position's
 * pixel (from `wcs`); `notices` then says where the position falls in the cut-out. Throws
 * InputError, naming `file`, when the box leaves the frame or the frame has no celestial WCS.
 */
export function cutoutBox(
  request: CutoutRequest, frameColumns: number, frameRows: number, pixelScaleArcsec: number, wcs: CelestialWcs | undefined, file: string, notices: string[],
): CutoutBox {
  let box: CutoutBox;
  if (request.kind === 'pixels') {
    for (const [name, value, min] of [['column0', request.column0, 0], ['row0', request.row0, 0], ['columns', request.columns, 4], ['rows', request.rows, 4]] as const) {
      if (!Number.isInteger(value) || value < min) throw new InputError(`cut-out ${name}: expected a whole number >= ${min}, found ${value}`, { file });
    }
    box = request;
  } else {
    if (wcs === undefined) {
      throw new InputError('cut-out about a sky position: expected a celestial WCS (CTYPE1 = RA---TAN, CTYPE2 = DEC--TAN) in the image header, found none', { file, key: 'CTYPE1' });
    }
    const side = Math.round(request.sideArcsec / pixelScaleArcsec);
    if (!(side >= 4)) throw new InputError(`cut-out side: expected at least 4 pixels (${4 * pixelScaleArcsec}"), found ${request.sideArcsec}"`, { file });
    const { column, row } = wcs.skyToPixel(request.raDeg, request.decDeg);
    if (!Number.isFinite(column) || !Number.isFinite(row)) {
      throw new InputError(`cut-out centre RA ${request.raDeg}, Dec ${request.decDeg}: expected a position the image's TAN projection can show, found one 90 degrees or more from its tangent point`, { file });
    }
    box = { column0: Math.round(column - (side - 1) / 2), row0: Math.round(row - (side - 1) / 2), columns: side, rows: side };
    // Rounded to a milliarcsecond, without the sign of a rounded-away negative zero.
    const offset = (value: number): string => (Math.abs(value) < 5e-4 ? '0.000' : value.toFixed(3));
    const x = offset((column - box.column0 - (side - 1) / 2) * pixelScaleArcsec);
    const y = offset((row - box.row0 - (side - 1) / 2) * pixelScaleArcsec);
    notices.push(
      `${file}: cut-out of ${side} x ${side} pixels from (column ${box.column0}, row ${box.row0}), counted from 0, about RA ${request.raDeg}, Dec ${request.decDeg}, ` +
        `which lies at pixel (${column.toFixed(2)}, ${row.toFixed(2)}) of the frame and at x = ${x}", y = ${y}" in the cut-out`,
    );
  }
  if (box.column0 + box.columns > frameColumns || box.row0 + box.rows > frameRows || box.column0 < 0 || box.row0 < 0) {
    throw new InputError(
      `cut-out outside the frame: expected ${describeCutoutRequest(request)} to lie within the ${frameColumns} x ${frameRows} pixels of the image, ` +
        `found columns ${box.column0} to ${box.column0 + box.columns - 1} and rows ${box.row0} to ${box.row0 + box.rows - 1}`,
      { file },
    );
  }
  return box;
}

/** The values of `box` from a row-major frame `frameColumns` wide, row-major in the box. */
export function cutOutValues(values: Float64Array, frameColumns: number, box: CutoutBox): Float64Array {
  const out = new Float64Array(box.columns * box.rows);
  for (let j = 0; j < box.rows; j++) {
    const from = (box.row0 + j) * frameColumns + box.column0;
    out.set(values.subarray(from, from + box.columns), j * box.columns);
  }
  return out;
}
