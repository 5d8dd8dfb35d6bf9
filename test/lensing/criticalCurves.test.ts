import { describe, expect, it } from 'vitest';
import { isothermalEllipsoid } from '../../src/lens/index.js';
import type { MassTerm } from '../../src/lensing/massTerm.js';
import { pointMass } from '../../src/perturber/index.js';
import { criticalCurves } from '../../src/lensing/criticalCurves.js';

// Critical curves and caustics traced on a grid of spacing SPACING against closed forms.
// Tolerance (common practice for a grid-traced contour, argued here): a vertex is the zero of the
// straight line through det A at two nodes one SPACING apart. Expanding det A = f(r) about the
// curve, that zero is off by about SPACING^2 |f''| / (8 |f'|) (the quadratic term of f), and an edge
// cutting the curve obliquely adds at most the sagitta of a chord of the curve, SPACING^2 / (8 R)
// for a circle of radius R. The finite-difference error of det A (step SPACING / 100) is below 1e-8
// relative, far below both.
const SPACING = 0.01;
const NODES = 400;
const secondOrderTolerance = (fRatio: number, radius: number): number => (SPACING ** 2 / 8) * (fRatio + 1 / radius);
const centres = (offset: number): Float64Array => Float64Array.from({ length: NODES }, (_, k) => offset + (k - (NODES - 1) / 2) * SPACING);
const xCentres = centres(0);
const yCentres = centres(0);

function vertices(curves: Float64Array[]): [number, number][] {
  return curves.flatMap((c) => Array.from({ length: c.length / 2 }, (_, k): [number, number] => [c[2 * k], c[2 * k + 1]]));
}

describe('criticalCurves', () => {
  it('puts the critical curve of an SIS on its Einstein ring and its tangential caustic at the centre', () => {
    // Schneider, Ehlers & Falco 1992, sec. 8.1.4: for the SIS det A = 1 - thetaE / r, so the critical
    // curve is the circle r = thetaE, mapped by beta = theta (1 - thetaE / r) onto the point beta = 0.
    const thetaE = 1;
    const cx = 0.013;
    const cy = -0.007;
    const profile = Float64Array.of(thetaE, 1, 0, cx, cy, 0);
    const terms: MassTerm[] = [{ profile: isothermalEllipsoid, offset: 0 }];
    const curves = criticalCurves(terms, profile, xCentres, yCentres);
    expect(curves.spacingArcsec).toBeCloseTo(SPACING, 12);
    expect(curves.critical.length).toBe(1);
    const critical = vertices(curves.critical);
    expect(critical.length).toBeGreaterThan(300);
    // f = 1 - thetaE / r: |f''| / |f'| = 2 / thetaE at r = thetaE.
    const tolerance = secondOrderTolerance(2 / thetaE, thetaE);
    for (const [x, y] of critical) expect(Math.abs(Math.hypot(x - cx, y - cy) - thetaE)).toBeLessThanOrEqual(tolerance);
    // |beta| = |r - thetaE| on the SIS, so the caustic vertices lie within the same distance of the centre.
    for (const [bx, by] of vertices(curves.caustics)) expect(Math.hypot(bx - cx, by - cy)).toBeLessThanOrEqual(tolerance);
  });

  it('puts the critical curve of a point mass on its Einstein ring', () => {
    // Schneider, Ehlers & Falco 1992, sec. 8.1.2: alpha = thetaE^2 theta / r^2, det A = 1 - thetaE^4 / r^4,
    // critical circle r = thetaE, caustic the point beta = 0 with |beta| = |r - thetaE| (r + thetaE) / r.
    const thetaE = 0.8;
    const cx = -0.21;
    const cy = 0.14;
    const terms: MassTerm[] = [{ profile: pointMass, offset: 0 }];
    const curves = criticalCurves(terms, Float64Array.of(thetaE, cx, cy), xCentres, yCentres);
    const critical = vertices(curves.critical);
    expect(critical.length).toBeGreaterThan(200);
    // f = 1 - thetaE^4 / r^4: |f''| / |f'| = 5 / thetaE at r = thetaE.
    const tolerance = secondOrderTolerance(5 / thetaE, thetaE);
    for (const [x, y] of critical) expect(Math.abs(Math.hypot(x - cx, y - cy) - thetaE)).toBeLessThanOrEqual(tolerance);
    // With |r - thetaE| <= tolerance: |beta| <= tolerance (2 thetaE + tolerance) / (thetaE - tolerance).
    const causticTolerance = (tolerance * (2 * thetaE + tolerance)) / (thetaE - tolerance);
    for (const [bx, by] of vertices(curves.caustics)) expect(Math.hypot(bx - cx, by - cy)).toBeLessThanOrEqual(causticTolerance);
  });

  it('traces the SIE critical ellipse and the extent of its tangential caustic', () => {
    // Kormann, Schneider & Bartelmann 1994: for the singular isothermal ellipsoid kappa = |gamma|,
    // so det A = 1 - 2 kappa and the tangential critical curve is the iso-density ellipse
    // xi = sqrt(q x'^2 + y'^2 / q) = thetaE (in this normalisation; src/lens/isothermalEllipsoid.ts).
    const thetaE = 1;
    const q = 0.7;
    const angle = (30 * Math.PI) / 180;
    const profile = Float64Array.of(thetaE, q, 30, 0, 0, 0);
    const terms: MassTerm[] = [{ profile: isothermalEllipsoid, offset: 0 }];
    const curves = criticalCurves(terms, profile, xCentres, yCentres);
    const rotate = (x: number, y: number): [number, number] => [x * Math.cos(angle) + y * Math.sin(angle), -x * Math.sin(angle) + y * Math.cos(angle)];
    const critical = vertices(curves.critical);
    expect(critical.length).toBeGreaterThan(300);
    // In xi, det A = 1 - thetaE / xi is the SIS's, with lengths stretched by up to max|grad xi| = 1 / sqrt(q):
    // the SIS tolerance with SPACING / sqrt(q) for SPACING, i.e. divided by q.
    const tolerance = secondOrderTolerance(2 / thetaE, thetaE) / q;
    for (const [x, y] of critical) {
      const [u, v] = rotate(x, y);
      expect(Math.abs(Math.sqrt(q * u * u + (v * v) / q) - thetaE)).toBeLessThanOrEqual(tolerance);
    }
    // The cusps of the tangential caustic lie on the axes, images of the ellipse's vertices under the
    // closed-form SIE deflection of Kormann, Schneider & Bartelmann 1994 (b = thetaE sqrt(q), e = sqrt(1 - q^2)):
    // major axis: x' = thetaE / sqrt(q), alpha = (b / e) atan(e / q); minor axis: y' = b, alpha = (b / e) atanh(e).
    const b = thetaE * Math.sqrt(q);
    const e = Math.sqrt(1 - q * q);
    const cuspMajor = thetaE / Math.sqrt(q) - (b / e) * Math.atan(e / q);
    const cuspMinor = (b / e) * Math.atanh(e) - b;
    const caustic = vertices(curves.caustics).map(([x, y]) => rotate(x, y));
    const extentMajor = Math.max(...caustic.map(([u]) => Math.abs(u)));
    const extentMinor = Math.max(...caustic.map(([, v]) => Math.abs(v)));
    // Same tolerance: a vertex that far off the critical curve maps within tolerance ||A|| of its
    // caustic point, ||A|| = 1 - kappa + |gamma| = 1 there; near a cusp the caustic is stationary
    // along the curve (its tangent is A's null direction), so the vertices nearest it miss the cusp
    // only to second order in their spacing.
    expect(Math.abs(extentMajor - cuspMajor)).toBeLessThanOrEqual(tolerance);
    expect(Math.abs(extentMinor - cuspMinor)).toBeLessThanOrEqual(tolerance);
  });
});
