import { describe, expect, it } from 'vitest';
import { externalShear } from '../../src/lens/externalShear.js';
import {
  annulusPoints, deflectionAt, halfDivergence, lensJacobian, potentialGradient, relativeVectorError,
} from './profileProbes.js';

// The deflection is linear, so central differences are exact up to rounding: with
// |alpha| <= 0.2 * 4 arcsec and h = 1e-4 arcsec, rounding is ~1e-16 * 0.8 / 1e-4 ~ 1e-12.
const STEP_ARCSEC = 1e-4;
const ROUNDING_TOLERANCE = 1e-10;

describe('externalShear', () => {
  const p = Float64Array.of(0.17, 37); // shearStrength, shearAngleDeg
  const points = annulusPoints(30, 0.05, 4, 0.3, -0.1);

  it('has zero convergence: adds nothing, and half the divergence of alpha vanishes', () => {
    // A pure shear is traceless (Schneider, Ehlers & Falco 1992, ch. 5 "Properties of the lens
    // mapping"; chapter checked, section not).
    const kappa = Float64Array.of(0.25, -1);
    externalShear.addConvergence(p, 0, Float64Array.of(1, 2), Float64Array.of(0.5, -3), 2, kappa);
    expect(Array.from(kappa)).toEqual([0.25, -1]);
    for (const [x, y] of points) {
      expect(Math.abs(halfDivergence(externalShear, p, x, y, STEP_ARCSEC))).toBeLessThan(ROUNDING_TOLERANCE);
    }
  });

  it('alpha is the gradient of psi = (gamma/2) r^2 cos 2(phi - phiGamma)', () => {
    // The stated potential, differentiated numerically.
    for (const [x, y] of points) {
      // Quadratic psi: central differences exact up to rounding ~1e-16 * |psi| / h ~ 1e-12.
      const gradient = potentialGradient(externalShear, p, x, y, STEP_ARCSEC);
      const [ax, ay] = deflectionAt(externalShear, p, x, y);
      expect(Math.hypot(gradient[0] - ax, gradient[1] - ay)).toBeLessThan(ROUNDING_TOLERANCE);
    }
  });

  it('stretches images along shearAngleDeg: Jacobian eigenvalues 1 -+ gamma along / across it', () => {
    // Shear matrix of the lens equation, A = [[1 - g1, -g2], [-g2, 1 + g1]] (Schneider, Ehlers &
    // Falco 1992, ch. 5, chapter checked): eigenvector (cos phi, sin phi) with eigenvalue 1 - gamma.
    for (const [gamma, angleDeg] of [[0.17, 37], [0.05, -120], [0.3, 90]]) {
      const q = Float64Array.of(gamma, angleDeg);
      const [a, b, c, d] = lensJacobian(externalShear, q, 0.7, -1.2, STEP_ARCSEC);
      const along = [Math.cos(angleDeg * Math.PI / 180), Math.sin(angleDeg * Math.PI / 180)];
      const across = [-along[1], along[0]];
      const image = (v: number[]) => [a * v[0] + b * v[1], c * v[0] + d * v[1]];
      expect(relativeVectorError(image(along), along.map((v) => (1 - gamma) * v))).toBeLessThan(ROUNDING_TOLERANCE);
      expect(relativeVectorError(image(across), across.map((v) => (1 + gamma) * v))).toBeLessThan(ROUNDING_TOLERANCE);
    }
  });

  it('acts about the origin, not a lens centre', () => {
    // Common practice: the shear term has no centre parameter, alpha(0, 0) = 0.
    expect(deflectionAt(externalShear, p, 0, 0)).toEqual([0, 0]);
  });
});
