import { describe, expect, it } from 'vitest';
import { isothermalEllipsoid } from '../../../src/lens/isothermalEllipsoid/isothermalEllipsoid.js';
import { homoeoidDeflection } from '../homoeoidDeflection.js';
import { gaussLegendre } from '../gaussLegendre.js';
import {
  annulusPoints, convergenceAt, deflectionAt, lensJacobian, poissonErrors,
  relativeVectorError,
} from '../profileProbes.js';

// Parameters in the order of parameterNames:
// einsteinRadiusArcsec, axisRatio, positionAngleDeg, centerXArcsec, centerYArcsec, coreRadiusArcsec
const sieParameters = (thetaE: number, q: number, angleDeg: number, cx: number, cy: number, core: number) =>
  Float64Array.of(thetaE, q, angleDeg, cx, cy, core);

// Central-difference step: truncation error ~ h^2/6 |d^3 alpha| ~ h^2/6 * thetaE / r^3 and
// rounding ~ 1e-16 |alpha| / h; with h = 1e-4 arcsec and r >= 0.3 arcsec (minor-axis radius
// >= 0.2 arcsec for q >= 0.5) both stay below ~3e-7 * kappa, hence the 1e-6 relative tolerance.
const STEP_ARCSEC = 1e-4;
const DIFFERENCE_TOLERANCE = 1e-6;

// The quadrature of the reference integral converges to ~1e-13 (checked below by comparing a
// 24-point and a 40-point rule) and the closed forms are exact up to rounding, so a 1e-11
// relative mismatch would be a real discrepancy.
const INTEGRAL_TOLERANCE = 1e-11;

const points = annulusPoints(40, 0.3, 3.0, 0.1, -0.2);

describe('isothermalEllipsoid', () => {
  it('reduces to the SIS with |alpha| = thetaE everywhere at q = 1, no core', () => {
    // Definition of the singular isothermal sphere (Schneider, Ehlers & Falco 1992, ch. 8 "Simple lens models"):
    // alpha = thetaE theta/|theta|.
    const p = sieParameters(1.3, 1, 25, 0.1, -0.2, 0);
    for (const [x, y] of annulusPoints(200, 0.01, 20, 0.1, -0.2)) {
      const [ax, ay] = deflectionAt(isothermalEllipsoid, p, x, y);
      expect(Math.hypot(ax, ay)).toBeCloseTo(1.3, 13);
      // Radial direction: alpha parallel to theta - centre.
      expect(Math.abs(ax * (y + 0.2) - ay * (x - 0.1))).toBeLessThan(1e-12);
    }
  });

  it('the reference quadrature is converged', () => {
    // Self-check of the test's own integral: two rules must agree far below INTEGRAL_TOLERANCE.
    const kappa = (xi: number) => 0.5 / xi;
    const a = homoeoidDeflection(kappa, 0.5, 30, 0, 0, 1, 0.7, 0.4, gaussLegendre(24));
    const b = homoeoidDeflection(kappa, 0.5, 30, 0, 0, 1, 0.7, 0.4, gaussLegendre(40));
    expect(relativeVectorError(a, b)).toBeLessThan(1e-12);
  });

  for (const q of [0.2, 0.5, 0.7, 0.9, 1 - 1e-5, 1 - 1e-7]) {
    it(`matches the homoeoid integral of its convergence, q = ${q}`, () => {
      // Schramm 1990 / Keeton 2001 sec. 2, integrated numerically in homoeoidDeflection.
      // q = 1 - 1e-7 exercises the near-circular series branch, q = 1 - 1e-5 the direct one.
      const thetaE = 1.2;
      const p = sieParameters(thetaE, q, 30, 0.1, -0.2, 0);
      const kappa = (xi: number) => thetaE / (2 * xi);
      for (const [x, y] of points) {
        const reference = homoeoidDeflection(kappa, q, 30, 0.1, -0.2, 1, x, y);
        expect(relativeVectorError(deflectionAt(isothermalEllipsoid, p, x, y), reference)).toBeLessThan(INTEGRAL_TOLERANCE);
      }
    });
  }

  for (const [q, core] of [[0.5, 0.05], [0.7, 0.3], [0.9, 0.1]]) {
    it(`cored form matches the homoeoid integral, q = ${q}, core ${core}"`, () => {
      // Keeton 2001 softened isothermal against Schramm 1990 / Keeton 2001 sec. 2.
      const thetaE = 1.1;
      const p = sieParameters(thetaE, q, -50, 0.1, -0.2, core);
      const kappa = (xi: number) => thetaE / (2 * Math.sqrt(xi * xi + core * core));
      for (const [x, y] of [...points, [0.12, -0.19] as [number, number]]) {
        const reference = homoeoidDeflection(kappa, q, -50, 0.1, -0.2, 0, x, y);
        expect(relativeVectorError(deflectionAt(isothermalEllipsoid, p, x, y), reference)).toBeLessThan(INTEGRAL_TOLERANCE);
      }
    });
  }

  for (const [q, core] of [[0.6, 0], [0.8, 0.2], [1, 0], [1, 0.2]]) {
    it(`kappa is half the divergence of alpha and alpha the gradient of psi, q = ${q}, core ${core}`, () => {
      // Poisson equation of lensing, div alpha = 2 kappa, alpha = grad psi
      // (Schneider, Ehlers & Falco 1992, ch. 5 "Properties of the lens mapping"), by central differences.
      const errors = poissonErrors(isothermalEllipsoid, sieParameters(1.4, q, 70, 0.1, -0.2, core), points, STEP_ARCSEC);
      expect(errors.kappa).toBeLessThan(DIFFERENCE_TOLERANCE);
      expect(errors.gradient).toBeLessThan(DIFFERENCE_TOLERANCE);
    });
  }

  it('without a core, the critical curve is the ellipse xi = thetaE', () => {
    // For the SIE |shear| = kappa, so det A = 1 - 2 kappa vanishes where kappa = 1/2, the
    // isodensity ellipse xi = thetaE (Kormann, Schneider & Bartelmann 1994, A&A 284, 285; the paper
    // was not reachable here, and the determinant is checked numerically below).
    // Numerical Jacobian, h = 1e-4 arcsec: det error ~ h^2 / xi^2 ~ 1e-8, hence 1e-6.
    const thetaE = 1.2, q = 0.6, angleDeg = 35, cx = 0.1, cy = -0.2;
    const p = sieParameters(thetaE, q, angleDeg, cx, cy, 0);
    const c = Math.cos(angleDeg * Math.PI / 180), s = Math.sin(angleDeg * Math.PI / 180);
    const determinantAt = (scale: number, u: number) => {
      const xr = scale * thetaE * Math.cos(u) / Math.sqrt(q), yr = scale * thetaE * Math.sqrt(q) * Math.sin(u);
      const [a, b, cc, d] = lensJacobian(isothermalEllipsoid, p, cx + c * xr - s * yr, cy + s * xr + c * yr, STEP_ARCSEC);
      return a * d - b * cc;
    };
    for (let k = 0; k < 36; k++) {
      const u = 2 * Math.PI * (k + 0.3) / 36;
      expect(Math.abs(determinantAt(1, u))).toBeLessThan(1e-6);
      expect(determinantAt(0.9, u)).toBeLessThan(-0.05);
      expect(determinantAt(1.1, u)).toBeGreaterThan(0.05);
    }
  });

  it('SIS images at beta +- thetaE with magnifications 1 +- thetaE/beta', () => {
    // Schneider, Ehlers & Falco 1992, ch. 8 "Simple lens models": for beta < thetaE an SIS forms images at
    // x = beta + thetaE and x = beta - thetaE with signed magnifications 1 + thetaE/beta and
    // 1 - thetaE/beta. Images found by Newton's method on the lens equation with the profile's
    // own deflection; magnification from the numerical Jacobian of that deflection.
    const thetaE = 1.5, beta = 0.4;
    const p = sieParameters(thetaE, 1, 0, 0, 0, 0);
    const images: Array<[number, number]> = [];
    for (const [x0, y0] of annulusPoints(24, 0.2, 4)) {
      const image = solveLensEquation(p, beta, 0, x0, y0);
      if (image !== undefined && !images.some(([u, v]) => Math.hypot(u - image[0], v - image[1]) < 1e-6)) images.push(image);
    }
    images.sort((a, b) => b[0] - a[0]);
    expect(images.length).toBe(2);
    expect(images[0][0]).toBeCloseTo(beta + thetaE, 10);
    expect(images[1][0]).toBeCloseTo(beta - thetaE, 10);
    for (const image of images) expect(Math.abs(image[1])).toBeLessThan(1e-10);
    const magnification = ([x, y]: [number, number]) => {
      const [a, b, c, d] = lensJacobian(isothermalEllipsoid, p, x, y, STEP_ARCSEC);
      return 1 / (a * d - b * c);
    };
    // Central differences at |theta| >= 1.1 arcsec: relative error ~ h^2/|theta|^2 ~ 1e-8.
    expect(magnification(images[0]) / (1 + thetaE / beta) - 1).toBeLessThan(1e-6);
    expect(Math.abs(magnification(images[1]) / (1 - thetaE / beta) - 1)).toBeLessThan(1e-6);
  });
});

/** Newton's method on theta - alpha(theta) = beta from (x0, y0); undefined if it does not converge. */
function solveLensEquation(p: Float64Array, betaX: number, betaY: number, x0: number, y0: number): [number, number] | undefined {
  let x = x0, y = y0;
  for (let iteration = 0; iteration < 100; iteration++) {
    const [ax, ay] = deflectionAt(isothermalEllipsoid, p, x, y);
    const fx = x - ax - betaX, fy = y - ay - betaY;
    if (Math.hypot(fx, fy) < 1e-13) return [x, y];
    const [a, b, c, d] = lensJacobian(isothermalEllipsoid, p, x, y, 1e-6);
    const det = a * d - b * c;
    x -= (d * fx - b * fy) / det;
    y -= (a * fy - c * fx) / det;
    if (!Number.isFinite(x + y) || Math.hypot(x, y) > 100) return undefined;
  }
  return undefined;
}
