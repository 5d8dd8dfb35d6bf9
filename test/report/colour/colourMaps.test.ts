import { describe, expect, it } from 'vitest';
import { divergingColourMap } from '../../../src/report/colour/divergingColourMap.js';
import { sequentialColourMap } from '../../../src/report/colour/sequentialColourMap.js';
import { colourIndex, type ColourMap } from '../../../src/report/colour/colourMap.js';
import { linearFromSrgb, linearSrgbFromOklab, oklabFromLinearSrgb } from '../../../src/report/colour/oklab.js';

// CIE 1976 lightness L* of an 8-bit sRGB colour, computed here independently of OKLab (the space the
// maps are built in): sRGB decoding per IEC 61966-2-1, relative luminance Y with the ITU-R BT.709
// primaries' coefficients 0.2126, 0.7152, 0.0722, and L* = 116 f(Y) - 16 of CIE 15:2004.
function cieLightness(red: number, green: number, blue: number): number {
  const decode = (byte: number): number => {
    const v = byte / 255;
    return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
  };
  const y = 0.2126 * decode(red) + 0.7152 * decode(green) + 0.0722 * decode(blue);
  return y > 216 / 24389 ? 116 * Math.cbrt(y) - 16 : (24389 / 27) * y;
}

const lightnessOf = (map: ColourMap): number[] =>
  Array.from({ length: map.size }, (_, k) => cieLightness(map.bytes[3 * k], map.bytes[3 * k + 1], map.bytes[3 * k + 2]));

describe('OKLab conversion', () => {
  it('gives the OKLab coordinates CSS Color 4 lists for the sRGB primaries', () => {
    // CSS Color Module Level 4 (W3C), OKLab examples: red oklab(0.6280 0.2249 0.1258), lime
    // oklab(0.8664 -0.2339 0.1795), blue oklab(0.4520 -0.0325 -0.3115). Recalled, not checked: the
    // spec was not reachable here (the next test checks a value that was). Four decimals, so the
    // tolerance is half a unit of the fourth decimal plus float noise.
    const cases: [readonly [number, number, number], readonly [number, number, number]][] = [
      [[1, 0, 0], [0.628, 0.2249, 0.1258]],
      [[0, 1, 0], [0.8664, -0.2339, 0.1795]],
      [[0, 0, 1], [0.452, -0.0325, -0.3115]],
    ];
    for (const [rgb, lab] of cases) {
      const got = oklabFromLinearSrgb(rgb);
      for (let c = 0; c < 3; c++) expect(Math.abs(got[c] - lab[c])).toBeLessThan(6e-5);
    }
    // White is L = 1 on the achromatic axis (Ottosson 2020 normalises the space so), to the 10 digits of the matrices.
    const white = oklabFromLinearSrgb([1, 1, 1]);
    expect(white[0]).toBeCloseTo(1, 7);
    expect(Math.hypot(white[1], white[2])).toBeLessThan(1e-6);
  });

  it('gives the OKLab of sRGB #008000 that the W3C web-platform-tests use', () => {
    // web-platform-tests css/css-color/oklab-001.html: "oklab(51.975% -0.1403 0.10768) /* green
    // (sRGB #008000) converted to OKLab */". Half a unit of each value's last digit is allowed.
    const green = oklabFromLinearSrgb([0, linearFromSrgb(128 / 255), 0]);
    expect(Math.abs(green[0] - 0.51975)).toBeLessThanOrEqual(5e-6);
    expect(Math.abs(green[1] - -0.1403)).toBeLessThanOrEqual(5e-5);
    expect(Math.abs(green[2] - 0.10768)).toBeLessThanOrEqual(5e-6);
  });

  it('round-trips linear sRGB through OKLab', () => {
    // The published forward and inverse matrices are each other's inverse to about 1e-9 (10 digits given).
    for (const rgb of [[0.2, 0.5, 0.9], [0.01, 0.99, 0.3], [0.7, 0.7, 0.7]] as const) {
      const back = linearSrgbFromOklab(oklabFromLinearSrgb(rgb));
      for (let c = 0; c < 3; c++) expect(back[c]).toBeCloseTo(rgb[c], 6);
    }
  });
});

describe('the sequential map', () => {
  const lightness = lightnessOf(sequentialColourMap);

  it('rises strictly in CIE L* from entry to entry, even after rounding to bytes', () => {
    // Monotonic lightness is what makes a sequential map readable in grey and by colour-blind
    // readers (common practice for scientific colour maps).
    for (let k = 1; k < lightness.length; k++) expect(lightness[k]).toBeGreaterThan(lightness[k - 1]);
  });

  it('spans a wide lightness range and stays inside the sRGB gamut', () => {
    // A range of at least 80 L* units gives the 256 entries distinct shades (common practice).
    expect(lightness[lightness.length - 1] - lightness[0]).toBeGreaterThan(80);
    expect(sequentialColourMap.clippedEntries).toBe(0);
  });

  it('runs from blue to yellow, the opponent axis red-green colour-blind viewers keep', () => {
    // OKLab b < 0 is blue, b > 0 yellow (Ottosson 2020); the dark end is blue, the light end yellow.
    const b = (k: number): number => sequentialColourMap.oklab[3 * k + 2];
    expect(b(0)).toBeLessThan(-0.05);
    expect(b(sequentialColourMap.size - 1)).toBeGreaterThan(0.05);
  });
});

describe('the diverging map', () => {
  const map = divergingColourMap;
  const lightness = lightnessOf(map);
  const centre = colourIndex(map, 0.5);

  it('puts the value half-way, zero of a symmetric range, on its lightest entry', () => {
    expect(centre).toBe((map.size - 1) / 2);
    expect(Math.max(...lightness)).toBe(lightness[centre]);
    expect(lightness[centre]).toBeGreaterThan(95);
  });

  it('falls strictly in CIE L* from the centre towards both ends', () => {
    // Monotonic lightness along each arm (common practice for diverging maps).
    for (let k = 1; k <= centre; k++) expect(lightness[k]).toBeGreaterThan(lightness[k - 1]);
    for (let k = centre + 1; k < map.size; k++) expect(lightness[k]).toBeLessThan(lightness[k - 1]);
  });

  it('gives equal lightness to equal distances either side of zero', () => {
    // The arms are mirror images in OKLab L by construction; in CIE L* they must agree within one
    // just-noticeable difference, about 2.3 units (Mahy, Van Eycken & Oosterlinck 1994, as cited by
    // Sharma 2003, Digital Color Imaging Handbook; seen only in secondary citations here).
    for (let k = 0; k < centre; k++) expect(Math.abs(lightness[k] - lightness[map.size - 1 - k])).toBeLessThan(2.3);
    expect(map.clippedEntries).toBe(0);
  });

  it('is blue below zero and red-orange above', () => {
    // Blue against orange-red stays distinguishable under red-green colour blindness (common
    // practice); in OKLab, blue has b < 0 and the rust arm a > 0.
    for (let k = 0; k < centre - 10; k++) expect(map.oklab[3 * k + 2]).toBeLessThan(0);
    for (let k = centre + 10; k < map.size; k++) expect(map.oklab[3 * k + 1]).toBeGreaterThan(0);
  });
});
