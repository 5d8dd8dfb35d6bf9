import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { multipole, multipoleOrders, type MultipoleOrder } from '../../src/lens/multipole.js';
import { powerLawEllipsoid } from '../../src/lens/powerLawEllipsoid.js';
import {
  annulusPoints, convergenceAt, deflectionAt, halfDivergence, potentialAt, potentialGradient,
} from './profileProbes.js';

// Parameters in the order of parameterNames:
// multipoleStrength, multipoleAngleDeg, centerXArcsec, centerYArcsec, einsteinRadiusArcsec, slope
const multipoleParameters = (a: number, angleDeg: number, cx: number, cy: number, thetaE: number, slope: number) =>
  Float64Array.of(a, angleDeg, cx, cy, thetaE, slope);

const centre = [0.2, -0.1] as const;
const thetaE = 1.25;

/** Convergence of the circular main lens (power law, q = 1) with the same thetaE and slope. */
const circularKappa = (slope: number, x: number, y: number) =>
  convergenceAt(powerLawEllipsoid, Float64Array.of(thetaE, slope, 1, 0, centre[0], centre[1]), x, y);

// Central differences with h = 1e-4 arcsec at r >= 0.3 arcsec. Errors are measured in units of
// a * kappa_circ(r) (times r for alpha) because the multipole changes sign with angle. The
// truncation error h^2/6 |d^3 alpha| grows as m^2 h^2 / r^2 relative to that scale, ~3e-7 for
// m = 4 at r = 0.3; the largest error seen while writing the test was 7e-8, hence 1e-6.
const STEP_ARCSEC = 1e-4;
const DIFFERENCE_TOLERANCE = 1e-6;

// Slopes across the valid range, the m = 1 resonance (slope 2) and its immediate neighbours.
const slopes = [1.3, 1.6, 2.0, 2.0 - 1e-7, 2.0 + 1e-7, 2.4, 2.8];

describe('multipole', () => {
  for (const m of multipoleOrders) {
    for (const slope of slopes) {
      it(`order ${m}, slope ${slope}: kappa is half the divergence of alpha, alpha the gradient of psi`, () => {
        // Poisson equation of lensing, div alpha = 2 kappa, alpha = grad psi (Schneider, Ehlers
        // & Falco 1992, ch. 5 "Properties of the lens mapping"; chapter checked, section not), by
        // central differences.
        const profile = multipole(m);
        const a = 0.03;
        const p = multipoleParameters(a, 27, centre[0], centre[1], thetaE, slope);
        for (const [x, y] of annulusPoints(40, 0.3, 3, centre[0], centre[1])) {
          const r = Math.hypot(x - centre[0], y - centre[1]);
          const kappaScale = a * circularKappa(slope, x, y);
          const kappa = convergenceAt(profile, p, x, y);
          expect(Math.abs(halfDivergence(profile, p, x, y, STEP_ARCSEC) - kappa)).toBeLessThan(DIFFERENCE_TOLERANCE * kappaScale);
          const [ax, ay] = deflectionAt(profile, p, x, y);
          const [gx, gy] = potentialGradient(profile, p, x, y, STEP_ARCSEC);
          expect(Math.hypot(gx - ax, gy - ay)).toBeLessThan(DIFFERENCE_TOLERANCE * kappaScale * r);
        }
      });
    }

    it(`order ${m}: angular mean of kappa is 0 and its m-th Fourier coefficient is a kappa_circ(r)`, () => {
      // The stated normalisation kappa = a kappa_circ(r) cos(m (phi - phiM)), with kappa_circ the
      // main lens's circular power-law convergence; Fourier coefficients by the trapezoidal rule
      // on 64 angles, exact for trigonometric polynomials of degree below 64.
      const profile = multipole(m);
      const a = 0.07, angleDeg = -63;
      for (const slope of [1.6, 2.0, 2.4]) {
        const p = multipoleParameters(a, angleDeg, centre[0], centre[1], thetaE, slope);
        for (const r of [0.4, thetaE, 2.7]) {
          const steps = 64;
          const coefficients = new Float64Array(2 * 6);
          let mean = 0;
          for (let k = 0; k < steps; k++) {
            const phi = 2 * Math.PI * k / steps;
            const kappa = convergenceAt(profile, p, centre[0] + r * Math.cos(phi), centre[1] + r * Math.sin(phi));
            mean += kappa / steps;
            for (let j = 1; j <= 5; j++) {
              coefficients[2 * j] += 2 * kappa * Math.cos(j * (phi - angleDeg * Math.PI / 180)) / steps;
              coefficients[2 * j + 1] += 2 * kappa * Math.sin(j * (phi - angleDeg * Math.PI / 180)) / steps;
            }
          }
          const scale = a * circularKappa(slope, centre[0] + r, centre[1]);
          expect(Math.abs(mean)).toBeLessThan(1e-14);
          for (let j = 1; j <= 5; j++) {
            expect(Math.abs(coefficients[2 * j] - (j === m ? scale : 0))).toBeLessThan(1e-13 * scale / a);
            expect(Math.abs(coefficients[2 * j + 1])).toBeLessThan(1e-13 * scale / a);
          }
          if (r === thetaE) expect(coefficients[2 * m]).toBeCloseTo(a * (3 - slope) / 2, 14);
        }
      }
    });
  }

  it('order 1 is continuous through the resonance at slope 2', () => {
    // At slope 2 the m = 1 potential is (a thetaE / 2) r ln(r / thetaE) cos(phi - phiM), the
    // Poisson solution for kappa = (a thetaE / 2r) cos(phi - phiM): lap(r ln r cos phi) = 2 cos phi / r.
    // Neighbouring slopes must approach it at first order in (slope - 2).
    const profile = multipole(1);
    const a = 0.05, angleDeg = 40;
    const at = (slope: number) => multipoleParameters(a, angleDeg, centre[0], centre[1], thetaE, slope);
    for (const [x, y] of annulusPoints(30, 0.1, 4, centre[0], centre[1])) {
      const dx = x - centre[0], dy = y - centre[1], r = Math.hypot(dx, dy);
      const expected = 0.5 * a * thetaE * r * Math.log(r / thetaE) * Math.cos(Math.atan2(dy, dx) - angleDeg * Math.PI / 180);
      const psi = potentialAt(profile, at(2), x, y);
      expect(Math.abs(psi - expected)).toBeLessThan(1e-15 * (1 + r * r));
      for (const delta of [1e-6, -1e-6]) {
        const [ax, ay] = deflectionAt(profile, at(2), x, y), [bx, by] = deflectionAt(profile, at(2 + delta), x, y);
        // d(alpha)/d(slope) is of order a * (1 + ln^2 rho) <= 0.05 * 10 here.
        expect(Math.hypot(ax - bx, ay - by)).toBeLessThan(1e-6);
        expect(Math.abs(potentialAt(profile, at(2 + delta), x, y) - psi)).toBeLessThan(1e-6);
      }
    }
  });

  it('refuses orders other than 1, 3, 4', () => {
    // Orders offered are stated in src/lens/multipole.ts.
    expect(() => multipole(2 as MultipoleOrder)).toThrow(InputError);
    expect(multipole(3).kind).toBe('multipole3');
    expect(multipole(4).parameterNames).toEqual([
      'multipoleStrength', 'multipoleAngleDeg', 'centerXArcsec', 'centerYArcsec', 'einsteinRadiusArcsec', 'slope',
    ]);
  });
});
