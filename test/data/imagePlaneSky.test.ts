import { describe, expect, it } from 'vitest';
import { ImagePlaneSky } from '../../src/data/index.js';
import type { CelestialWcsDescription } from '../../src/fits/index.js';

// At the tangent point of a TAN WCS with a diagonal CD matrix the pixel axes point exactly east
// or west and north (Calabretta & Greisen 2002: intermediate x grows eastwards, y northwards), so
// position angles there follow in closed form: east of north = 90 - theta with east along +x
// (a mirrored sky, det CD > 0), theta + 270 with east along -x (the sky as seen, det CD < 0: +x
// points west, 270 degrees east of north, and +y north).
const s = 0.1 / 3600;
function sky(cd: [number, number, number, number]): ImagePlaneSky {
  // 41 x 41 pixels, CRPIX at the centre pixel (FITS 21 = arcsift's 20): x = y = 0 is the tangent point.
  const wcs: CelestialWcsDescription = { projection: 'TAN', frame: 'ICRS', equinox: null, crpix: [21, 21], crvalDeg: [150, 30], cdDeg: cd, lonpoleDeg: 180 };
  return new ImagePlaneSky({ columns: 41, rows: 41, pixelScaleArcsec: 0.1, wcs }, wcs);
}

describe('image plane and sky', () => {
  it('puts the image centre at CRVAL and turns angles in the closed form at the tangent point', () => {
    const seen = sky([-s, 0, 0, s]);
    const mirrored = sky([s, 0, 0, s]);
    const centre = seen.skyOf(0, 0);
    expect(centre.raDeg).toBeCloseTo(150, 12);
    expect(centre.decDeg).toBeCloseTo(30, 12);
    // 1e-9 degrees: the rounding of a bearing over the 100-pixel chord (fits/celestialWcs.ts).
    for (const theta of [0, 25, 90, 200]) {
      expect(Math.abs(((seen.eastOfNorthDeg(theta) - (theta + 270) + 540) % 360) - 180)).toBeLessThan(1e-9);
      expect(Math.abs(((mirrored.eastOfNorthDeg(theta) - (90 - theta) + 540) % 360) - 180)).toBeLessThan(1e-9);
    }
  });

  it('maps a posterior summary of an angle, swapping the bounds for a mirrored sky and unwrapping about the median', () => {
    const summary = { median: 30, interval68: [20, 40] as const, interval95: [10, 95] as const };
    const mirrored = sky([s, 0, 0, s]).eastOfNorthSummary(summary);
    expect(mirrored.median).toBeCloseTo(60, 9);
    expect(mirrored.interval68[0]).toBeCloseTo(50, 9);
    expect(mirrored.interval68[1]).toBeCloseTo(70, 9);
    // 90 - 95 = -5: kept below 0, next to the median, rather than wrapped to 355.
    expect(mirrored.interval95[0]).toBeCloseTo(-5, 9);
    expect(mirrored.interval95[1]).toBeCloseTo(80, 9);
    // 100 + 270 = 370 -> 10; the bound 80 + 270 = 350 stays next to it as -10.
    const seen = sky([-s, 0, 0, s]).eastOfNorthSummary({ median: 100, interval68: [80, 120] as const, interval95: [70, 130] as const });
    expect(seen.median).toBeCloseTo(10, 9);
    expect(seen.interval68[0]).toBeCloseTo(-10, 9);
    expect(seen.interval68[1]).toBeCloseTo(30, 9);
  });

  it('finds the image-plane position of a sky position and back', () => {
    const turned = sky([-s * Math.cos(0.5), s * Math.sin(0.5), s * Math.sin(0.5), s * Math.cos(0.5)]);
    const target = turned.skyOf(0.73, -1.12);
    const back = turned.positionOf(target.raDeg, target.decDeg);
    expect(Math.abs(back.xArcsec - 0.73)).toBeLessThan(1e-9);
    expect(Math.abs(back.yArcsec + 1.12)).toBeLessThan(1e-9);
  });
});
