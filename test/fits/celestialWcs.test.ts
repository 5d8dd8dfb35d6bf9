import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { InputError } from '../../src/errors.js';
import { CelestialWcs, FitsHeader, floatCard, readFitsImage, stringCard, type HeaderCard } from '../../src/fits/index.js';

// The TAN WCS of a pipeline-shaped file (CD matrix rotated by 30 degrees) against astropy.wcs and
// astropy.coordinates: test/fixtures/pipeline/make_pipeline.py wrote the file and the values.
const folder = new URL('../fixtures/pipeline/', import.meta.url);
const expected = JSON.parse(readFileSync(new URL('expected.json', folder), 'utf8'));
const sci = readFitsImage(fileURLToPath(new URL('observation.fits', folder)), { hdu: 'SCI' });
const wcs = CelestialWcs.fromHeader(sci.header) as CelestialWcs;

/** Degrees of arc between two positions, for comparing RA at the declination of the field. */
function arcsecApart(ra1: number, dec1: number, ra2: number, dec2: number): number {
  return Math.hypot((ra1 - ra2) * Math.cos((dec1 * Math.PI) / 180), dec1 - dec2) * 3600;
}

describe('celestial WCS (TAN) against astropy', () => {
  it('reads the frame and the matrix of the SCI header', () => {
    expect(wcs.description).toMatchObject({ projection: 'TAN', frame: 'ICRS', crpix: [30, 28.5], crvalDeg: [201.365, -43.0191], lonpoleDeg: 180 });
  });

  it('maps pixels to RA/Dec as astropy.wcs does', () => {
    // Both evaluate the same closed forms in double precision; 1e-9 arcsec is far below any
    // astrometric use and well above the rounding of a few trigonometric calls (about 1e-11").
    for (const p of expected.pixelToSky) {
      const sky = wcs.pixelToSky(p.column, p.row);
      expect(arcsecApart(sky.raDeg, sky.decDeg, p.raDeg, p.decDeg)).toBeLessThan(1e-9);
    }
  });

  it('maps RA/Dec to pixels as astropy.wcs does', () => {
    // 1e-8 pixel: sky positions carry about 1e-15 rad of rounding, 4e-9 pixel at 0.08" per pixel.
    for (const p of expected.skyToPixel) {
      const pixel = wcs.skyToPixel(p.raDeg, p.decDeg);
      expect(Math.abs(pixel.column - p.column)).toBeLessThan(1e-8);
      expect(Math.abs(pixel.row - p.row)).toBeLessThan(1e-8);
    }
  });

  it('turns counter-clockwise-from-x angles into east of north as astropy position angles, and back', () => {
    // astropy: position_angle between the pixels half a pixel either side along the direction.
    // astropy: position_angle from the pixel to one 50 pixels along the direction (arcsift: 100);
    // a straight pixel line is a great circle under TAN, so both are exact up to rounding, about
    // 1e-9 degrees each; 1e-8 degrees allows ten times that.
    for (const a of expected.positionAngles) {
      const east = wcs.eastOfNorthDeg(a.counterClockwiseFromXDeg, a.column, a.row);
      const difference = ((east - a.eastOfNorthDeg + 540) % 360) - 180;
      expect(Math.abs(difference)).toBeLessThan(1e-8);
      const back = wcs.counterClockwiseFromXDeg(east, a.column, a.row);
      expect(Math.abs(((back - a.counterClockwiseFromXDeg + 540) % 360) - 180)).toBeLessThan(1e-9);
    }
  });

  it('keeps the sky of a pixel through a cut-out', () => {
    const cut = wcs.cutOut(14, 12);
    const a = wcs.pixelToSky(33.5, 31.5);
    const b = cut.pixelToSky(19.5, 19.5);
    expect(b.raDeg).toBe(a.raDeg);
    expect(b.decDeg).toBe(a.decDeg);
  });
});

describe('celestial WCS: what is refused', () => {
  const header = (cards: HeaderCard[]): FitsHeader => new FitsHeader(cards, 'frame.fits');
  const tan = [floatCard('CRPIX1', 1), floatCard('CRPIX2', 1), floatCard('CRVAL1', 10), floatCard('CRVAL2', 20), floatCard('CDELT1', -1e-5), floatCard('CDELT2', 1e-5)];

  it('answers undefined for a header without sky axes (arcsift\'s own offsets)', () => {
    expect(CelestialWcs.fromHeader(header([stringCard('CTYPE1', 'OFFSET-X'), stringCard('CTYPE2', 'OFFSET-Y'), ...tan]))).toBeUndefined();
    expect(CelestialWcs.fromHeader(header(tan))).toBeUndefined();
  });

  it('refuses SIP distortions, other projections and swapped axes, naming the keyword', () => {
    const cases: [string, string, RegExp][] = [
      ['RA---TAN-SIP', 'DEC--TAN-SIP', /frame\.fits, key CTYPE1: .*'RA---TAN', found 'RA---TAN-SIP'; the distortion terms/],
      ['RA---SIN', 'DEC--SIN', /key CTYPE1: .*TAN\) projection only/],
      ['DEC--TAN', 'RA---TAN', /key CTYPE1: .*right ascension along NAXIS1/],
    ];
    for (const [c1, c2, message] of cases) {
      const call = (): unknown => CelestialWcs.fromHeader(header([stringCard('CTYPE1', c1), stringCard('CTYPE2', c2), ...tan]));
      expect(call).toThrow(InputError);
      expect(call).toThrow(message);
    }
  });

  it('defaults the frame to ICRS, FK5 or FK4 from EQUINOX (Calabretta & Greisen 2002 sec. 3.1)', () => {
    const sky = [stringCard('CTYPE1', 'RA---TAN'), stringCard('CTYPE2', 'DEC--TAN'), ...tan];
    expect(CelestialWcs.fromHeader(header(sky))?.description.frame).toBe('ICRS');
    expect(CelestialWcs.fromHeader(header([...sky, floatCard('EQUINOX', 2000)]))?.description).toMatchObject({ frame: 'FK5', equinox: 2000 });
    expect(CelestialWcs.fromHeader(header([...sky, floatCard('EQUINOX', 1950)]))?.description).toMatchObject({ frame: 'FK4', equinox: 1950 });
  });
});
