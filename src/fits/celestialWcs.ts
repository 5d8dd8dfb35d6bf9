import { InputError } from '../errors.js';
import { defaultLonpoleDeg, tanDeproject, tanProject, type TanPole } from './gnomonicProjection.js';
import type { FitsHeader } from './header.js';
import { skyPositionAngleDeg, skySeparationDeg } from './skyBearing.js';
import { wcsLinearMatrix } from './wcsLinearMatrix.js';

/** A position on the sky in the frame of the header (RADESYS), degrees. */
export interface SkyPosition {
  readonly raDeg: number;
  readonly decDeg: number;
}

/** What a run record says of the WCS it used, as the header gave it (after any cut-out). */
export interface CelestialWcsDescription {
  readonly projection: 'TAN';
  /** RADESYS, or the default of Calabretta & Greisen (2002) sec. 3.1 (ICRS without EQUINOX). */
  readonly frame: string;
  readonly equinox: number | null;
  /** CRPIX1, CRPIX2: FITS pixel coordinates, counted from 1 at the centre of the first pixel. */
  readonly crpix: readonly [number, number];
  readonly crvalDeg: readonly [number, number];
  /** The pixel-to-projection-plane matrix in degrees per pixel, [CD1_1, CD1_2, CD2_1, CD2_2] (from CD, or PC with CDELT). */
  readonly cdDeg: readonly [number, number, number, number];
  readonly lonpoleDeg: number;
}

/**
 * The pixel step used to read the local sky direction of a pixel axis. A straight line of pixels
 * is a great circle under the gnomonic projection, so the bearing from a pixel towards another
 * along a line is that line's direction at the pixel whatever the step. A long step keeps the
 * bearing's rounding small: sky positions carry about 1e-15 rad of rounding, which over a
 * one-pixel chord (0.1") would be 1e-7 degrees, over 100 pixels 1e-9.
 */
const DIRECTION_STEP_PIXELS = 100;

const DEG = Math.PI / 180;

function wrap360(angleDeg: number): number {
  const a = angleDeg % 360;
  return a < 0 ? a + 360 : a;
}

function frameOf(header: FitsHeader): { frame: string; equinox: number | null } {
  const equinox = header.getNumber('EQUINOX') ?? null;
  const stated = header.getString('RADESYS')?.trim().toUpperCase();
  if (stated !== undefined && stated !== '') {
    const defaultEquinox = stated === 'FK4' ? 1950 : stated === 'FK5' ? 2000 : null;
    return { frame: stated, equinox: equinox ?? defaultEquinox };
  }
  if (equinox === null) return { frame: 'ICRS', equinox: null };
  return { frame: equinox < 1984 ? 'FK4' : 'FK5', equinox };
}

/**
 * A celestial FITS WCS with the gnomonic (TAN) projection, Greisen & Calabretta (2002, A&A 395,
 * 1061) and Calabretta & Greisen (2002, A&A 395, 1077): pixel -> intermediate world coordinates
 * by CRPIX and the CD (or PC x CDELT) matrix, then TAN deprojection about CRVAL. Pixels here are
 * arcsift's (column, row) counted from 0, FITS pixel coordinates minus 1.
 */
export class CelestialWcs {
  readonly description: CelestialWcsDescription;
  private readonly pole: TanPole;
  private readonly inverse: readonly [number, number, number, number];
  private readonly scratch = new Float64Array(2);

  constructor(description: CelestialWcsDescription) {
    this.description = description;
    this.pole = { raDeg: description.crvalDeg[0], decDeg: description.crvalDeg[1], lonpoleDeg: description.lonpoleDeg };
    const [a, b, c, d] = description.cdDeg;
    const det = a * d - b * c;
    this.inverse = [d / det, -b / det, -c / det, a / det];
  }

  /**
   * The WCS of a header, or undefined when CTYPE1 and CTYPE2 do not name RA and Dec (no sky
   * coordinates, e.g. arcsift's own offsets). Throws InputError, naming the file and keyword,
   * for a celestial WCS arcsift cannot use: another projection than TAN (SIP or TPV
   * distortions included), swapped axes, or a missing or singular matrix.
   */
  static fromHeader(header: FitsHeader, where = ''): CelestialWcs | undefined {
    const ctype1 = header.getString('CTYPE1')?.trimEnd().toUpperCase() ?? '';
    const ctype2 = header.getString('CTYPE2')?.trimEnd().toUpperCase() ?? '';
    const celestial = /^(RA|DEC)-/;
    if (!celestial.test(ctype1) && !celestial.test(ctype2)) return undefined;
    const place = (key: string): { file?: string; key: string } => ({ file: header.source, key });
    const context = where === '' ? '' : ` (${where})`;
    if (!(ctype1.startsWith('RA--') && ctype2.startsWith('DEC-'))) {
      throw new InputError(
        `celestial WCS${context}: expected CTYPE1 = 'RA---TAN' and CTYPE2 = 'DEC--TAN' (right ascension along NAXIS1), found '${ctype1}' and '${ctype2}'`,
        place('CTYPE1'),
      );
    }
    for (const [key, ctype, base] of [['CTYPE1', ctype1, 'RA---TAN'], ['CTYPE2', ctype2, 'DEC--TAN']] as const) {
      if (ctype !== base) {
        const distortion = /(SIP|TPV|TNX|ZPX)$/.test(ctype)
          ? '; the distortion terms it names are not read: use a distortion-corrected (resampled) product, whose CTYPEs are RA---TAN and DEC--TAN'
          : '; arcsift reads the gnomonic (TAN) projection only';
        throw new InputError(`celestial WCS${context}: expected '${base}', found '${ctype}'${distortion}`, place(key));
      }
    }
    const linear = wcsLinearMatrix(header);
    if (linear === undefined) {
      throw new InputError(`celestial WCS${context}: expected CD1_1..CD2_2, or CDELT1 and CDELT2 (with PCi_j), in degrees, found none`, place('CD1_1'));
    }
    const cdDeg = linear.matrixArcsec.map((v) => v / 3600) as unknown as [number, number, number, number];
    if (cdDeg[0] * cdDeg[3] - cdDeg[1] * cdDeg[2] === 0) {
      throw new InputError(`celestial WCS${context}: the ${linear.from} matrix is singular`, place(linear.from === 'CD' ? 'CD1_1' : 'CDELT1'));
    }
    const number = (key: string): number => {
      const value = header.getNumber(key);
      if (value === undefined || !Number.isFinite(value)) {
        throw new InputError(`celestial WCS${context}: expected a number, found ${value === undefined ? 'no such keyword' : value}`, place(key));
      }
      return value;
    };
    const crval: [number, number] = [number('CRVAL1'), number('CRVAL2')];
    if (!(Math.abs(crval[1]) <= 90)) throw new InputError(`celestial WCS${context}: expected a declination from -90 to 90, found ${crval[1]}`, place('CRVAL2'));
    const { frame, equinox } = frameOf(header);
    return new CelestialWcs({
      projection: 'TAN',
      frame,
      equinox,
      crpix: [number('CRPIX1'), number('CRPIX2')],
      crvalDeg: crval,
      cdDeg,
      lonpoleDeg: header.getNumber('LONPOLE') ?? defaultLonpoleDeg(crval[1]),
    });
  }

  /** The same sky seen from a cut-out whose pixel (0, 0) is pixel (column0, row0) of this frame. */
  cutOut(column0: number, row0: number): CelestialWcs {
    const d = this.description;
    return new CelestialWcs({ ...d, crpix: [d.crpix[0] - column0, d.crpix[1] - row0] });
  }

  /** The sky position of pixel (column, row), counted from 0 (fractions allowed). */
  pixelToSky(column: number, row: number): SkyPosition {
    const [m11, m12, m21, m22] = this.description.cdDeg;
    const u = column + 1 - this.description.crpix[0];
    const v = row + 1 - this.description.crpix[1];
    tanDeproject(m11 * u + m12 * v, m21 * u + m22 * v, this.pole, this.scratch);
    return { raDeg: this.scratch[0], decDeg: this.scratch[1] };
  }

  /** The pixel (column, row), counted from 0, of a sky position; NaN for one the projection cannot show. */
  skyToPixel(raDeg: number, decDeg: number): { readonly column: number; readonly row: number } {
    tanProject(raDeg, decDeg, this.pole, this.scratch);
    const [x, y] = this.scratch;
    const [i11, i12, i21, i22] = this.inverse;
    return { column: i11 * x + i12 * y + this.description.crpix[0] - 1, row: i21 * x + i22 * y + this.description.crpix[1] - 1 };
  }

  /**
   * The local sky direction of the two pixel axes at (column, row): [east, north] in arcsec per
   * pixel for a step along +column, then for a step along +row, from the separation and the
   * bearing of the pixel one step away (exact for the direction, see DIRECTION_STEP_PIXELS; the
   * length is the chord's, within 1e-12 relative of the local scale for steps of arcseconds).
   */
  localAxes(column: number, row: number): readonly [number, number, number, number] {
    const h = DIRECTION_STEP_PIXELS;
    const from = this.pixelToSky(column, row);
    const step = (dc: number, dr: number): [number, number] => {
      const to = this.pixelToSky(column + h * dc, row + h * dr);
      const lengthArcsec = (skySeparationDeg(from.raDeg, from.decDeg, to.raDeg, to.decDeg) * 3600) / h;
      const bearing = skyPositionAngleDeg(from.raDeg, from.decDeg, to.raDeg, to.decDeg) * DEG;
      return [lengthArcsec * Math.sin(bearing), lengthArcsec * Math.cos(bearing)];
    };
    return [...step(1, 0), ...step(0, 1)] as [number, number, number, number];
  }

  /**
   * A position angle counter-clockwise from +x (the column axis towards the row axis, arcsift's
   * image-plane convention) at pixel (column, row), as a position angle east of north in [0, 360).
   */
  eastOfNorthDeg(counterClockwiseFromXDeg: number, column: number, row: number): number {
    const [eColumn, nColumn, eRow, nRow] = this.localAxes(column, row);
    const c = Math.cos(counterClockwiseFromXDeg * DEG);
    const s = Math.sin(counterClockwiseFromXDeg * DEG);
    return wrap360(Math.atan2(eColumn * c + eRow * s, nColumn * c + nRow * s) / DEG);
  }

  /** The inverse of eastOfNorthDeg: a position angle east of north as one counter-clockwise from +x, in [0, 360). */
  counterClockwiseFromXDeg(eastOfNorthDeg: number, column: number, row: number): number {
    const [eColumn, nColumn, eRow, nRow] = this.localAxes(column, row);
    const east = Math.sin(eastOfNorthDeg * DEG);
    const north = Math.cos(eastOfNorthDeg * DEG);
    // Solve [eColumn eRow; nColumn nRow] (u, v) = (east, north) for the pixel-axis direction (u, v).
    const det = eColumn * nRow - eRow * nColumn;
    const u = (nRow * east - eRow * north) / det;
    const v = (eColumn * north - nColumn * east) / det;
    return wrap360(Math.atan2(v, u) / DEG);
  }
}
