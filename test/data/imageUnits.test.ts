import { describe, expect, it } from 'vitest';
import { countsPerSecondScale } from '../../src/data/index.js';
import { FitsHeader, floatCard, stringCard, type FitsImage, type HeaderCard } from '../../src/fits/index.js';

// BUNIT spellings of FITS Standard 4.0 sec. 4.3 (units: '/', '.', '**', '^', blanks between
// factors) and those pipelines write (ELECTRONS/S, COUNTS, DN/S, e-/s, MJy/sr): arcsift's own
// reading of them, common practice.
function image(cards: HeaderCard[], primary: HeaderCard[] = []): FitsImage {
  return { data: new Float64Array(1), nx: 1, ny: 1, bitpix: -32, header: new FitsHeader(cards, 'x.fits'), hduIndex: 1, extname: 'SCI', primaryHeader: new FitsHeader(primary) };
}

describe('BUNIT to counts per second', () => {
  it('keeps rates', () => {
    for (const unit of ['counts/s', 'ELECTRONS/S', 'electron/s', 'e-/s', 'DN/s', 'count s-1', 'count.s**-1', 'ct/s', 'cps', 'adu / s', 'electrons s^-1']) {
      expect(countsPerSecondScale(image([stringCard('BUNIT', unit)]), 'x.fits[SCI]').factor, unit).toBe(1);
    }
  });

  it('divides totals by EXPTIME, from the HDU before the primary header', () => {
    for (const unit of ['ELECTRONS', 'electron', 'counts', 'DN', 'ADU', 'e-']) {
      expect(countsPerSecondScale(image([stringCard('BUNIT', unit)], [floatCard('EXPTIME', 400)]), 'x.fits[SCI]').factor, unit).toBe(1 / 400);
    }
    const both = countsPerSecondScale(image([stringCard('BUNIT', 'COUNTS'), floatCard('EXPTIME', 50)], [floatCard('EXPTIME', 400)]), 'x.fits[SCI]');
    expect([both.factor, both.how]).toEqual([1 / 50, "BUNIT 'COUNTS' divided by EXPTIME = 50 s (its header)"]);
  });

  it('divides MJy/sr by PHOTMJSR, and takes the image\'s unit for a noise map without BUNIT', () => {
    const surface = countsPerSecondScale(image([stringCard('BUNIT', 'MJy/sr'), floatCard('PHOTMJSR', 0.5)]), 'x.fits[SCI]');
    expect(surface.factor).toBe(2);
    expect(countsPerSecondScale(image([]), 'x.fits[ERR]', surface).factor).toBe(2);
    expect(countsPerSecondScale(image([]), 'x.fits[SCI]')).toEqual({ factor: 1, bunit: null, how: 'no BUNIT: taken to be counts per second' });
  });

  it('refuses a zero EXPTIME and other units', () => {
    expect(() => countsPerSecondScale(image([stringCard('BUNIT', 'electrons')], [floatCard('EXPTIME', 0)]), 'x.fits[SCI]')).toThrow(/found EXPTIME = 0 in the primary header/);
    for (const unit of ['Jy/beam', 'mag', 'electrons/pixel/hour']) {
      expect(() => countsPerSecondScale(image([stringCard('BUNIT', unit)]), 'x.fits[SCI]'), unit).toThrow(/not a unit arcsift can turn into counts per second/);
    }
  });
});
