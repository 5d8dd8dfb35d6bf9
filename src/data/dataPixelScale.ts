import { InputError } from '../errors.js';
import type { FitsImage } from '../fits/index.js';
import type { DataFileRole } from './dataFiles.js';

/**
 * How far (relative) a header's pixel scale may differ from the expected one. 1e-6 lets through
 * the rounding of CDELT written in degrees with 7 or more significant digits, and catches any
 * real mismatch: at 1e-6 the edge of a 1000-pixel image moves by 1e-3 pixel.
 */
export const PIXEL_SCALE_RELATIVE_TOLERANCE = 1e-6;

/** One data file read, with its role. */
export interface DataImage {
  readonly role: DataFileRole;
  readonly path: string;
  readonly image: FitsImage;
}

function scaleKey(image: FitsImage): string {
  return image.pixelScale?.from === 'CD' ? 'CD1_1' : 'CDELT1';
}

function agrees(found: number, expected: number): boolean {
  return Math.abs(found - expected) <= PIXEL_SCALE_RELATIVE_TOLERANCE * expected;
}

/**
 * The pixel scale in arcsec of a data set: the image header's (CDi_j, PCi_j or CDELTi), which
 * must give square pixels and agree with `expectedArcsec` within PIXEL_SCALE_RELATIVE_TOLERANCE
 * when both are known; else `expectedArcsec`, with a notice. Every other file whose header
 * states a pixel scale must agree with the one chosen. Throws InputError naming the file.
 */
export function dataPixelScaleArcsec(
  image: DataImage, others: readonly DataImage[], expectedArcsec: number | undefined, expectedFrom: string, notices: string[],
): number {
  const header = image.image.pixelScale;
  let scaleArcsec: number;
  if (header === undefined) {
    if (expectedArcsec === undefined) {
      throw new InputError(
        'no pixel scale: expected CDELT1 and CDELT2 (or CD1_1..CD2_2) with angular CUNITn in the image header, or a pixel scale given by the caller, found neither',
        { file: image.path },
      );
    }
    scaleArcsec = expectedArcsec;
    notices.push(`${image.path}: the header gives no pixel scale (no CDELTn or CDi_j); using ${expectedArcsec} arcsec from ${expectedFrom}`);
  } else {
    if (!header.square) {
      throw new InputError(`pixels are not square: ${header.problem}`, { file: image.path, key: scaleKey(image.image) });
    }
    if (expectedArcsec !== undefined && !agrees(header.pixelScaleArcsec, expectedArcsec)) {
      throw new InputError(
        `pixel scale disagrees: expected ${expectedArcsec} arcsec (${expectedFrom}) within ${PIXEL_SCALE_RELATIVE_TOLERANCE} relative, found ${header.pixelScaleArcsec} arcsec from ${header.from} in the header`,
        { file: image.path, key: scaleKey(image.image) },
      );
    }
    scaleArcsec = header.pixelScaleArcsec;
  }
  for (const other of others) requireMatchingSteps(other, scaleArcsec, 'the image');
  return scaleArcsec;
}

/**
 * Checks that a data file whose header states a pixel scale has steps of `expectedArcsec` along
 * both axes within PIXEL_SCALE_RELATIVE_TOLERANCE (a file without one passes). Throws InputError
 * naming the file and keyword.
 */
export function requireMatchingSteps(other: DataImage, expectedArcsec: number, expectedFrom: string): void {
  const scale = other.image.pixelScale;
  if (scale === undefined) return;
  for (const [axis, stepArcsec] of [[1, scale.axis1Arcsec], [2, scale.axis2Arcsec]] as const) {
    if (!agrees(stepArcsec, expectedArcsec)) {
      throw new InputError(
        `${other.role} file pixel scale disagrees with ${expectedFrom}: expected ${expectedArcsec} arcsec per pixel within ${PIXEL_SCALE_RELATIVE_TOLERANCE} relative, found ${stepArcsec} arcsec along NAXIS${axis} from ${scale.from} in the header`,
        { file: other.path, key: scale.from === 'CD' ? `CD${axis}_${axis}` : `CDELT${axis}` },
      );
    }
  }
}
