import { InputError } from '../errors.js';
import type { FitsHeader, FitsImage } from '../fits/index.js';

/** How the values of one data image become counts per second per pixel, the unit of arcsift's model. */
export interface UnitScale {
  /** Multiply the stored (physical) values by this to get counts per second. */
  readonly factor: number;
  /** BUNIT as the header gave it (trimmed), or null when it has none. */
  readonly bunit: string | null;
  /** How the factor was found, for notices and run records. */
  readonly how: string;
}

/** Count-like units, singular or plural: counts, electrons, data numbers, analogue-digital units. */
const COUNT = '(counts?|cts?|electrons?|e-?|dn|adu)';
/** Per second in the spellings of FITS Standard 4.0 sec. 4.3 and common practice: /s, .s-1, s**-1, ... */
const PER_SECOND = '(/s|/sec|/second|\\.s-1|\\.s\\^-1|\\.s\\*\\*-1|\\.s\\^\\(-1\\)|\\.s\\*\\*\\(-1\\))';
const RATE = new RegExp(`^(${COUNT}${PER_SECOND}|cps)$`);
const TOTAL = new RegExp(`^${COUNT}$`);
const MJY_PER_SR = /^mjy(\/sr|\.sr-1|\.sr\*\*-1|\.sr\^-1)$/;

/** BUNIT lower-cased, blanks between factors written as '.', the FITS multiplication sign. */
function normalisedUnit(bunit: string): string {
  return bunit.trim().toLowerCase().replace(/\s*([/.*^])\s*/g, '$1').replace(/\s+/g, '.');
}

/** A keyword of the HDU's header, else of the primary header (where pipelines keep exposure keywords). */
function headerNumber(image: FitsImage, keyword: string): { value: number; where: string } | undefined {
  const headers: [FitsHeader | undefined, string][] = [[image.header, 'its header'], [image.primaryHeader, 'the primary header']];
  for (const [header, where] of headers) {
    const value = header?.getNumber(keyword);
    if (value !== undefined) return { value, where };
  }
  return undefined;
}

/**
 * The factor that turns one data image into counts per second per pixel, from its BUNIT: a
 * rate (counts/s, electrons/s, DN/s, ...) is kept; a total over the exposure (counts, electrons,
 * DN, ...) is divided by EXPTIME (the HDU's header, else the primary's); MJy/sr is divided by
 * PHOTMJSR (MJy/sr per DN/s, as some pipelines give it). Without BUNIT the values are taken to be
 * in `fallback`'s unit (the image's, for a noise map) or, for the image, counts per second.
 * Anything else throws InputError naming `where` (the file and HDU) and the keyword.
 */
export function countsPerSecondScale(image: FitsImage, where: string, fallback?: UnitScale): UnitScale {
  const stated = image.header.getString('BUNIT')?.trim();
  const hdu = `HDU ${image.hduIndex}${image.extname === undefined ? '' : ` (${image.extname})`}`;
  if (stated === undefined || stated === '') {
    if (fallback !== undefined) return { factor: fallback.factor, bunit: null, how: `no BUNIT: taken to be in the image's unit (${fallback.how})` };
    return { factor: 1, bunit: null, how: 'no BUNIT: taken to be counts per second' };
  }
  const unit = normalisedUnit(stated);
  if (RATE.test(unit)) return { factor: 1, bunit: stated, how: `BUNIT '${stated}', a rate: used as counts per second` };
  if (TOTAL.test(unit)) {
    const exposure = headerNumber(image, 'EXPTIME');
    if (exposure === undefined || !(exposure.value > 0) || !Number.isFinite(exposure.value)) {
      const found = exposure === undefined ? 'no EXPTIME in its header or the primary header' : `EXPTIME = ${exposure.value} in ${exposure.where}`;
      throw new InputError(
        `${hdu} holds a total over the exposure (BUNIT '${stated}'), not a rate: expected EXPTIME > 0 (seconds) to divide it by, found ${found}`,
        { file: where, key: 'EXPTIME' },
      );
    }
    return { factor: 1 / exposure.value, bunit: stated, how: `BUNIT '${stated}' divided by EXPTIME = ${exposure.value} s (${exposure.where})` };
  }
  if (MJY_PER_SR.test(unit)) {
    const photmjsr = headerNumber(image, 'PHOTMJSR');
    if (photmjsr === undefined || !(photmjsr.value > 0) || !Number.isFinite(photmjsr.value)) {
      throw new InputError(
        `${hdu} holds a surface brightness (BUNIT '${stated}'); arcsift's model is in counts per second per pixel: expected PHOTMJSR > 0 (MJy/sr per DN/s) to convert it, found ${photmjsr === undefined ? 'none' : photmjsr.value}`,
        { file: where, key: 'BUNIT' },
      );
    }
    return { factor: 1 / photmjsr.value, bunit: stated, how: `BUNIT '${stated}' divided by PHOTMJSR = ${photmjsr.value} (${photmjsr.where}) into DN/s` };
  }
  throw new InputError(
    `${hdu}: BUNIT '${stated}' is not a unit arcsift can turn into counts per second: expected a rate (counts/s, electrons/s, DN/s), ` +
      'a total over the exposure (counts, electrons, DN, with EXPTIME) or MJy/sr with PHOTMJSR; convert the image, or write one of these in BUNIT',
    { file: where, key: 'BUNIT' },
  );
}
