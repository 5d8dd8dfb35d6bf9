import { describe, expect, it } from 'vitest';
import { pointMass } from '../../src/perturber/pointMass.js';
import {
  annulusPoints, convergenceAt, deflectionAt, halfDivergence, lensJacobian, potentialGradient,
  relativeVectorError,
} from '../lens/profileProbes.js';

const thetaE = 0.05, cx = -0.3, cy = 0.6;
const p = Float64Array.of(thetaE, cx, cy);

// Newton's method on the lens equation beta = theta - alpha(theta), with the numerical Jacobian.
function solveLensEquation(betaX: number, betaY: number, startX: number, startY: number): [number, number] {
  let x = startX, y = startY;
  for (let iteration = 0; iteration < 100; iteration++) {
    const [ax, ay] = deflectionAt(pointMass, p, x, y);
    const fx = x - ax - betaX, fy = y - ay - betaY;
    const [a11, a12, a21, a22] = lensJacobian(pointMass, p, x, y, 1e-7 * thetaE);
    const det = a11 * a22 - a12 * a21;
    const dx = (a22 * fx - a12 * fy) / det, dy = (a11 * fy - a21 * fx) / det;
    x -= dx;
    y -= dy;
    if (Math.hypot(dx, dy) < 1e-15 * thetaE) break;
  }
  return [x, y];
}

describe('point mass against Paczynski 1986', () => {
  // Images of a source at u Einstein radii from the lens lie on the lens-source line at
  // theta = (u +- sqrt(u^2 + 4))/2 and magnify in total by (u^2 + 2)/(u sqrt(u^2 + 4))
  // (Paczynski 1986, ApJ 304, 1). Positions: Newton converges to rounding, 1e-12 relative.
  // Magnification: the Jacobian by central differences with h = 1e-6 theta_E errs by ~h^2/theta^2
  // ~ 1e-12 plus rounding ~1e-16/1e-6 = 1e-10 per entry; 1e-7 relative covers both.
  for (const u of [0.1, 0.5, 1, 2.5]) {
    it(`u = ${u}`, () => {
      const direction = 0.7;
      const c = Math.cos(direction), s = Math.sin(direction);
      const betaX = cx + u * thetaE * c, betaY = cy + u * thetaE * s;
      const root = Math.sqrt(u * u + 4);
      const expected = [(u + root) / 2, (u - root) / 2];
      const starts = [1.3 * expected[0], 0.7 * expected[1]];
      let totalMagnification = 0;
      starts.forEach((start, k) => {
        const [x, y] = solveLensEquation(betaX, betaY, cx + start * thetaE * c + 0.01 * thetaE, cy + start * thetaE * s);
        const along = ((x - cx) * c + (y - cy) * s) / thetaE;
        const across = (-(x - cx) * s + (y - cy) * c) / thetaE;
        expect(Math.abs(along / expected[k] - 1)).toBeLessThan(1e-12);
        expect(Math.abs(across)).toBeLessThan(1e-12);
        const [a11, a12, a21, a22] = lensJacobian(pointMass, p, x, y, 1e-6 * thetaE);
        totalMagnification += 1 / Math.abs(a11 * a22 - a12 * a21);
      });
      const paczynski = (u * u + 2) / (u * root);
      expect(Math.abs(totalMagnification / paczynski - 1)).toBeLessThan(1e-7);
    });
  }
});

describe('point mass fields', () => {
  const points = annulusPoints(30, 0.2 * thetaE, 20 * thetaE, cx, cy);
  it('has no convergence, and the divergence of alpha vanishes away from the centre', () => {
    // Central differences with h = 1e-4 r leave ~1e-8 of the shear theta_E^2/r^2; 1e-7 of it is
    // the bound (kappa = 0 exactly off-centre: Schneider, Ehlers & Falco 1992, point-mass lens).
    for (const [x, y] of points) {
      const r = Math.hypot(x - cx, y - cy);
      expect(convergenceAt(pointMass, p, x, y)).toBe(0);
      expect(Math.abs(halfDivergence(pointMass, p, x, y, 1e-4 * r))).toBeLessThan((1e-7 * thetaE * thetaE) / (r * r));
    }
  });
  it('alpha is theta_E^2 / r radially and the gradient of psi', () => {
    for (const [x, y] of points) {
      const r = Math.hypot(x - cx, y - cy);
      const alpha = deflectionAt(pointMass, p, x, y);
      expect(relativeVectorError(alpha, [(thetaE * thetaE * (x - cx)) / (r * r), (thetaE * thetaE * (y - cy)) / (r * r)]))
        .toBeLessThan(1e-14);
      expect(relativeVectorError(potentialGradient(pointMass, p, x, y, 1e-4 * r), alpha)).toBeLessThan(1e-6);
    }
  });
  it('gives finite numbers at its exact centre', () => {
    expect(deflectionAt(pointMass, p, cx, cy)).toEqual([0, 0]);
  });
});
