import { describe, expect, it } from 'vitest';
import { isothermalEllipsoid } from '../../src/lens/isothermalEllipsoid/isothermalEllipsoid.js';
import { powerLawEllipsoid } from '../../src/lens/powerLawEllipsoid.js';
import { homoeoidDeflection } from './homoeoidDeflection.js';
import {
  annulusPoints, convergenceAt, deflectionAt, poissonErrors, potentialAt,
  relativeVectorError,
} from './profileProbes.js';

// Parameters in the order of parameterNames:
// einsteinRadiusArcsec, slope, axisRatio, positionAngleDeg, centerXArcsec, centerYArcsec
const powerLawParameters = (thetaE: number, slope: number, q: number, angleDeg: number, cx: number, cy: number) =>
  Float64Array.of(thetaE, slope, q, angleDeg, cx, cy);

// The series is truncated at a tail bound of 1e-12 relative and the reference quadrature is
// converged to ~1e-13 (see isothermalEllipsoid.test.ts), so 1e-11 leaves room for rounding in
// the up to ~100 series terms (q = 0.2) and nothing more.
const INTEGRAL_TOLERANCE = 1e-11;

// Central differences as in isothermalEllipsoid.test.ts: h = 1e-4 arcsec, r >= 0.3 arcsec;
// for slope 2.4 the third derivative of alpha grows like r^-(gamma+1), still keeping the
// truncation error below ~5e-7 kappa at the smallest radius, hence 2e-6.
const STEP_ARCSEC = 1e-4;
const DIFFERENCE_TOLERANCE = 2e-6;

const points = annulusPoints(40, 0.3, 3.0, -0.15, 0.05);

describe('powerLawEllipsoid', () => {
  for (const slope of [1.6, 2.0, 2.4]) {
    for (const q of [0.2, 0.5, 0.7, 0.9]) {
      it(`matches the homoeoid integral of its convergence, slope ${slope}, q = ${q}`, () => {
        // Schramm 1990 / Keeton 2001 one-dimensional integrals (homoeoidDeflection.ts) of
        // kappa(xi) = ((3 - gamma)/2) (thetaE/xi)^(gamma - 1).
        const thetaE = 1.3;
        const p = powerLawParameters(thetaE, slope, q, 110, -0.15, 0.05);
        const kappa = (xi: number) => 0.5 * (3 - slope) * Math.pow(thetaE / xi, slope - 1);
        for (const [x, y] of points) {
          const reference = homoeoidDeflection(kappa, q, 110, -0.15, 0.05, slope - 1, x, y);
          expect(relativeVectorError(deflectionAt(powerLawEllipsoid, p, x, y), reference)).toBeLessThan(INTEGRAL_TOLERANCE);
        }
      });
    }
  }

  it('encloses mean convergence 1 within the ellipse xi = thetaE', () => {
    // Divergence theorem (Schneider, Ehlers & Falco 1992, ch. 5, chapter checked): the mass inside
    // a closed curve is (1/2) of the outward flux of alpha. Integrated around xi = thetaE by the
    // trapezoidal rule on 2000 points (spectrally accurate for a smooth periodic integrand).
    for (const [slope, q] of [[1.6, 0.5], [2.4, 0.8]]) {
      const thetaE = 1.1;
      const p = powerLawParameters(thetaE, slope, q, 0, 0, 0);
      const steps = 2000;
      let flux = 0;
      for (let k = 0; k < steps; k++) {
        const u = 2 * Math.PI * k / steps;
        // Ellipse q x^2 + y^2/q = thetaE^2: x = thetaE cos u / sqrt(q), y = thetaE sqrt(q) sin u.
        const x = thetaE * Math.cos(u) / Math.sqrt(q), y = thetaE * Math.sqrt(q) * Math.sin(u);
        // Outward normal times arc length element: (dy/du, -dx/du) du.
        const nx = thetaE * Math.sqrt(q) * Math.cos(u), ny = thetaE * Math.sin(u) / Math.sqrt(q);
        const [ax, ay] = deflectionAt(powerLawEllipsoid, p, x, y);
        flux += (ax * nx + ay * ny) * (2 * Math.PI / steps);
      }
      const meanKappa = 0.5 * flux / (Math.PI * thetaE * thetaE);
      expect(Math.abs(meanKappa - 1)).toBeLessThan(1e-10);
    }
  });

  it('at slope 2 equals the isothermal ellipsoid to 1e-10 relative', () => {
    // Tessore & Metcalf 2015: at t = 1 the series sums to the Kormann, Schneider & Bartelmann
    // 1994 closed form; both profiles share arcsift's Einstein-radius convention.
    for (const q of [0.3, 0.5, 0.75, 0.95, 1]) {
      const power = powerLawParameters(1.7, 2, q, -35, 0.2, 0.3);
      const isothermal = Float64Array.of(1.7, q, -35, 0.2, 0.3, 0);
      for (const [x, y] of annulusPoints(60, 0.01, 5, 0.2, 0.3)) {
        const a = deflectionAt(powerLawEllipsoid, power, x, y), b = deflectionAt(isothermalEllipsoid, isothermal, x, y);
        expect(relativeVectorError(a, b)).toBeLessThan(1e-10);
        const kappaA = convergenceAt(powerLawEllipsoid, power, x, y), kappaB = convergenceAt(isothermalEllipsoid, isothermal, x, y);
        expect(Math.abs(kappaA - kappaB)).toBeLessThan(1e-12 * kappaB);
        const psiA = potentialAt(powerLawEllipsoid, power, x, y), psiB = potentialAt(isothermalEllipsoid, isothermal, x, y);
        expect(Math.abs(psiA - psiB)).toBeLessThan(1e-10 * Math.abs(psiB));
      }
    }
  });

  for (const [slope, q] of [[1.6, 0.6], [2.0, 0.8], [2.4, 0.5], [2.9, 0.7], [1.2, 1]]) {
    it(`kappa is half the divergence of alpha and alpha the gradient of psi, slope ${slope}, q = ${q}`, () => {
      // Poisson equation of lensing, div alpha = 2 kappa, alpha = grad psi
      // (Schneider, Ehlers & Falco 1992, ch. 5 "Properties of the lens mapping"), by central differences.
      const errors = poissonErrors(powerLawEllipsoid, powerLawParameters(1.2, slope, q, 20, -0.15, 0.05), points, STEP_ARCSEC);
      expect(errors.kappa).toBeLessThan(DIFFERENCE_TOLERANCE);
      expect(errors.gradient).toBeLessThan(DIFFERENCE_TOLERANCE);
    });
  }

  it('is continuous towards q = 1 (the series shortens smoothly)', () => {
    // At q = 1 the profile is the circular power law, |alpha| = thetaE (r/thetaE)^(2 - gamma)
    // (mean convergence inside r; Schneider, Ehlers & Falco 1992, ch. 8 "Simple lens models").
    const thetaE = 0.9, slope = 2.3;
    for (const [x, y] of annulusPoints(20, 0.2, 3)) {
      const r = Math.hypot(x, y);
      const expected = thetaE * Math.pow(r / thetaE, 2 - slope);
      const round = deflectionAt(powerLawEllipsoid, powerLawParameters(thetaE, slope, 1, 0, 0, 0), x, y);
      expect(Math.abs(Math.hypot(...round) / expected - 1)).toBeLessThan(1e-14);
      const nearly = deflectionAt(powerLawEllipsoid, powerLawParameters(thetaE, slope, 1 - 1e-9, 0, 0, 0), x, y);
      // First order in 1 - q: the change is of order 1e-9.
      expect(relativeVectorError(nearly, round)).toBeLessThan(3e-9);
    }
  });
});
