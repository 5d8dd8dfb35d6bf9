import { InputError } from '../errors.js';
import type { FitsHeader } from './header.js';
import { wcsLinearMatrix, type WcsMatrixSource } from './wcsLinearMatrix.js';

/** The pixel size on the sky that a header's linear WCS keywords give. */
export interface PixelScale {
  /** Side of the square of equal area, sqrt(|det M|), with M the pixel-to-sky matrix in arcsec. */
  readonly pixelScaleArcsec: number;
  /** Sky step for one pixel along NAXIS1 (a column step): the length of M's first column. */
  readonly axis1Arcsec: number;
  /** Sky step for one pixel along NAXIS2 (a row step): the length of M's second column. */
  readonly axis2Arcsec: number;
  /** Cosine of the angle between the two pixel axes on the sky; 0 when they are perpendicular. */
  readonly skewCosine: number;
  /** Which keywords gave M. */
  readonly from: WcsMatrixSource;
  /** True when the two steps agree and the axes are perpendicular within the tolerance. */
  readonly square: boolean;
  /** What makes the pixels not square, when they are not. */
  readonly problem?: string;
}

/**
 * Default relative tolerance for square pixels: a 1e-3 difference in scale moves the edge of a
 * 100-pixel cutout by 0.1 pixel, about where a square-pixel model starts to misplace features.
 */
export const SQUARE_PIXEL_TOLERANCE = 1e-3;

/**
 * The pixel scale in arcsec from CDi_j, PCi_j with CDELTi, or CDELTi alone, or undefined when
 * the header has none of them or an axis unit is not an angle. Pixels count as square when the
 * two axis steps differ by at most `relativeTolerance` of the larger and the cosine of the angle
 * between the axes is at most `relativeTolerance`.
 */
export function pixelScaleFromHeader(header: FitsHeader, relativeTolerance: number = SQUARE_PIXEL_TOLERANCE): PixelScale | undefined {
  const linear = wcsLinearMatrix(header);
  if (linear === undefined) return undefined;
  const [m11, m12, m21, m22] = linear.matrixArcsec;
  const axis1Arcsec = Math.hypot(m11, m21);
  const axis2Arcsec = Math.hypot(m12, m22);
  const pixelScaleArcsec = Math.sqrt(Math.abs(m11 * m22 - m12 * m21));
  const skewCosine = axis1Arcsec > 0 && axis2Arcsec > 0 ? (m11 * m12 + m21 * m22) / (axis1Arcsec * axis2Arcsec) : 0;
  const problems: string[] = [];
  if (pixelScaleArcsec === 0) problems.push(`the ${linear.from} matrix is singular`);
  const larger = Math.max(axis1Arcsec, axis2Arcsec);
  if (Math.abs(axis1Arcsec - axis2Arcsec) > relativeTolerance * larger) {
    problems.push(`the steps along NAXIS1 (${axis1Arcsec} arcsec) and NAXIS2 (${axis2Arcsec} arcsec) differ by more than ${relativeTolerance} relative`);
  }
  if (Math.abs(skewCosine) > relativeTolerance) {
    problems.push(`the pixel axes are skewed (cosine of their angle ${skewCosine}, more than ${relativeTolerance})`);
  }
  const scale = { pixelScaleArcsec, axis1Arcsec, axis2Arcsec, skewCosine, from: linear.from, square: problems.length === 0 };
  return problems.length === 0 ? scale : { ...scale, problem: problems.join('; ') };
}

/** The pixel scale in arcsec, or an InputError naming the file when there is none or the pixels are not square. */
export function requireSquarePixelScaleArcsec(header: FitsHeader, relativeTolerance: number = SQUARE_PIXEL_TOLERANCE): number {
  const scale = pixelScaleFromHeader(header, relativeTolerance);
  if (scale === undefined) {
    throw new InputError('no pixel scale in the header: expected CDELT1 and CDELT2 or CD1_1..CD2_2 with angular CUNITn', {
      file: header.source,
    });
  }
  if (!scale.square) {
    throw new InputError(`pixels are not square: ${scale.problem}`, { file: header.source, key: scale.from === 'CD' ? 'CD1_1' : 'CDELT1' });
  }
  return scale.pixelScaleArcsec;
}
