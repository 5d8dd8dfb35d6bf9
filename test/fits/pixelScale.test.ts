import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { FitsHeader, floatCard, pixelScaleFromHeader, requireSquarePixelScaleArcsec, stringCard, type HeaderCard } from '../../src/fits/index.js';

function header(cards: readonly HeaderCard[]): FitsHeader {
  return new FitsHeader(cards, 'scale.fits');
}

function cdHeader(m11: number, m12: number, m21: number, m22: number): FitsHeader {
  return header([floatCard('CD1_1', m11), floatCard('CD1_2', m12), floatCard('CD2_1', m21), floatCard('CD2_2', m22)]);
}

describe('pixel scale from the linear WCS keywords (Greisen & Calabretta 2002, sec. 2.1)', () => {
  it('a rotated, east-left CD matrix of side s has scale s: |det| = s^2, each column of length s', () => {
    // CD = s R(theta) diag(-1, 1) in degrees; rotation and reflection keep lengths, so the scale is s exactly (closed form).
    const s = 0.04 / 3600;
    for (const degrees of [0, 17, 90, 233]) {
      const t = (degrees * Math.PI) / 180;
      const scale = pixelScaleFromHeader(cdHeader(-s * Math.cos(t), -s * Math.sin(t), -s * Math.sin(t), s * Math.cos(t)));
      expect(scale?.pixelScaleArcsec).toBeCloseTo(0.04, 14);
      expect(scale?.axis1Arcsec).toBeCloseTo(0.04, 14);
      expect(scale?.axis2Arcsec).toBeCloseTo(0.04, 14);
      expect(scale?.square).toBe(true);
    }
  });

  it('CDELT alone, missing CD elements as 0, and CUNITn in arcsec or mas', () => {
    expect(pixelScaleFromHeader(header([floatCard('CDELT1', -2.5e-5), floatCard('CDELT2', 2.5e-5)]))?.pixelScaleArcsec).toBeCloseTo(0.09, 14);
    // FITS WCS: CDi_j not given default to 0, so CD1_1 and CD2_2 alone make a diagonal matrix.
    expect(pixelScaleFromHeader(header([floatCard('CD1_1', -1e-5), floatCard('CD2_2', 1e-5)]))).toMatchObject({ from: 'CD', square: true });
    const arcsec = header([floatCard('CDELT1', 0.03), floatCard('CDELT2', 0.03), stringCard('CUNIT1', 'arcsec'), stringCard('CUNIT2', 'arcsec')]);
    expect(pixelScaleFromHeader(arcsec)?.pixelScaleArcsec).toBeCloseTo(0.03, 15);
    const mas = header([floatCard('CDELT1', 30), floatCard('CDELT2', 30), stringCard('CUNIT1', 'mas'), stringCard('CUNIT2', 'mas')]);
    expect(pixelScaleFromHeader(mas)?.pixelScaleArcsec).toBeCloseTo(0.03, 15);
  });

  it('no scale when the keywords are absent or an axis is not an angle', () => {
    expect(pixelScaleFromHeader(header([]))).toBeUndefined();
    expect(pixelScaleFromHeader(header([floatCard('CDELT1', 1e-5)]))).toBeUndefined();
    const metres = header([floatCard('CDELT1', 1), floatCard('CDELT2', 1), stringCard('CUNIT1', 'm'), stringCard('CUNIT2', 'm')]);
    expect(pixelScaleFromHeader(metres)).toBeUndefined();
    expect(() => requireSquarePixelScaleArcsec(header([]))).toThrow(InputError);
    expect(() => requireSquarePixelScaleArcsec(header([]))).toThrow(/scale\.fits: no pixel scale in the header/);
  });

  it('reports pixels that are not square beyond the tolerance: unequal steps or skewed axes', () => {
    const s = 1e-5;
    // Steps differ by 5e-4 relative: square at the default 1e-3, not at 1e-4.
    const unequal = cdHeader(-s, 0, 0, s * (1 + 5e-4));
    expect(pixelScaleFromHeader(unequal)?.square).toBe(true);
    expect(pixelScaleFromHeader(unequal, 1e-4)).toMatchObject({ square: false });
    expect(pixelScaleFromHeader(unequal, 1e-4)?.problem).toMatch(/differ by more than 0\.0001 relative/);
    // Equal steps 0.01 rad apart from perpendicular: cosine of the angle sin(0.01) ~ 0.01 > 1e-3.
    const skewed = cdHeader(s, s * Math.sin(0.01), 0, s * Math.cos(0.01));
    const scale = pixelScaleFromHeader(skewed);
    expect(scale?.skewCosine).toBeCloseTo(Math.sin(0.01), 14);
    expect(scale?.problem).toMatch(/skewed/);
    // The equal-area side is still sqrt|det| = s sqrt(cos 0.01).
    expect(scale?.pixelScaleArcsec).toBeCloseTo(3600 * s * Math.sqrt(Math.cos(0.01)), 14);
    expect(() => requireSquarePixelScaleArcsec(skewed)).toThrow(/scale\.fits, key CD1_1: pixels are not square: the pixel axes are skewed/);
  });
});
