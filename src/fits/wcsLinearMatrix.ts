import type { FitsHeader } from './header.js';

/** Which keywords gave a header's linear pixel-to-world matrix. */
export type WcsMatrixSource = 'CD' | 'PC' | 'CDELT';

/** The linear part of a header's WCS in arcsec per pixel, row-major [m11, m12, m21, m22]. */
export interface WcsLinearMatrix {
  /** Element m_ij is d(world axis i) / d(pixel axis j), world axes in arcsec. */
  readonly matrixArcsec: readonly [number, number, number, number];
  readonly from: WcsMatrixSource;
}

/** Arcseconds per unit for the angular CUNITi values of FITS Standard 4.0 sec. 4.3 (units). */
const ARCSEC_PER_UNIT: Readonly<Record<string, number>> = {
  deg: 3600,
  arcmin: 60,
  arcsec: 1,
  mas: 1e-3,
  rad: (180 * 3600) / Math.PI,
};

function hasAny(header: FitsHeader, prefix: string): boolean {
  return ['1_1', '1_2', '2_1', '2_2'].some((suffix) => header.has(`${prefix}${suffix}`));
}

/**
 * The linear part of the pixel-to-world transformation, Greisen & Calabretta (2002, A&A 395,
 * 1061) sec. 2.1: either CDi_j, or CDELTi x PCi_j (PC defaults to the identity, CD elements to
 * 0, PC taking precedence when both are given), in degrees unless CUNITi says otherwise.
 * Undefined when the header has none of them or an axis unit is not an angle.
 */
export function wcsLinearMatrix(header: FitsHeader): WcsLinearMatrix | undefined {
  const element = (prefix: string, i: number, j: number, fallback: number): number =>
    header.getNumber(`${prefix}${i}_${j}`) ?? fallback;
  let from: WcsMatrixSource;
  let matrix: [number, number, number, number];
  if (hasAny(header, 'PC') || (!hasAny(header, 'CD') && header.has('CDELT1') && header.has('CDELT2'))) {
    const cdelt1 = header.getNumber('CDELT1');
    const cdelt2 = header.getNumber('CDELT2');
    if (cdelt1 === undefined || cdelt2 === undefined) return undefined;
    from = hasAny(header, 'PC') ? 'PC' : 'CDELT';
    matrix = [
      cdelt1 * element('PC', 1, 1, 1),
      cdelt1 * element('PC', 1, 2, 0),
      cdelt2 * element('PC', 2, 1, 0),
      cdelt2 * element('PC', 2, 2, 1),
    ];
  } else if (hasAny(header, 'CD')) {
    from = 'CD';
    matrix = [element('CD', 1, 1, 0), element('CD', 1, 2, 0), element('CD', 2, 1, 0), element('CD', 2, 2, 0)];
  } else {
    return undefined;
  }
  for (const axis of [1, 2]) {
    const unit = (header.getString(`CUNIT${axis}`) ?? 'deg').trim();
    const factor = ARCSEC_PER_UNIT[unit];
    if (factor === undefined) return undefined;
    matrix[2 * (axis - 1)] *= factor;
    matrix[2 * (axis - 1) + 1] *= factor;
  }
  return { matrixArcsec: matrix, from };
}
