import { describe, expect, it } from 'vitest';
import {
  EllipticalGaussianSum, addEllipticalGaussianSumConvergence, addEllipticalGaussianSumDeflection,
} from '../../../src/lens/gaussianSum/ellipticalGaussianSum.js';
import { homoeoidDeflection } from '../homoeoidDeflection.js';
import { annulusPoints, relativeVectorError } from '../profileProbes.js';

/** Two Gaussians of different widths and one negative amplitude, as expansions have. */
function twoGaussians(): EllipticalGaussianSum {
  const sum = new EllipticalGaussianSum();
  sum.setScaled({ widths: Float64Array.of(0.35, 1.4), amplitudes: Float64Array.of(-0.2, 0.9), minRadius: 0, maxRadius: 1 }, 1, 1);
  return sum;
}
const kappaOf = (xi: number): number => -0.2 * Math.exp((-0.5 * xi * xi) / 0.35 ** 2) + 0.9 * Math.exp((-0.5 * xi * xi) / 1.4 ** 2);

function deflection(sum: EllipticalGaussianSum, q: number, angle: number, cx: number, cy: number, x: number, y: number): [number, number] {
  const ax = new Float64Array(1), ay = new Float64Array(1);
  addEllipticalGaussianSumDeflection(sum, q, angle, cx, cy, Float64Array.of(x), Float64Array.of(y), 1, ax, ay);
  return [ax[0], ay[0]];
}

const points: Array<[number, number]> = [
  ...annulusPoints(30, 0.002, 6, 0.1, -0.2), [0.1 + 40, -0.2 + 25], [0.1, -0.2 + 1e-7], [0.1 + 3, -0.2],
];

describe('elliptical Gaussian sum deflection', () => {
  for (const q of [0.15, 0.5, 0.8, 1 - 1e-6, 1 - 1e-12, 1]) {
    it(`matches the homoeoid integral of its convergence, q = ${q}`, () => {
      // Schramm 1990 / Keeton 2001 integrals (homoeoidDeflection.ts, converged to ~1e-13). The
      // Faddeeva function errs below 1.1e-14 relative and the series branch near the centre to
      // rounding; the points include r = 1e-7 (series), r = 3 and 47 (far outside, point-mass
      // regime). Measured worst below 1e-11 for every q; 1e-10 leaves room for the reference's
      // quadrature, not for a wrong branch (without the series the point at r = 1e-7 errs by
      // 1e-8 at q = 0.5 and 9e-4 at q = 1 - 1e-12).
      for (const [x, y] of points) {
        const reference = homoeoidDeflection(kappaOf, q, 35, 0.1, -0.2, 0, x, y);
        expect(relativeVectorError(deflection(twoGaussians(), q, 35, 0.1, -0.2, x, y), reference)).toBeLessThan(1e-10);
      }
    });
  }

  it('is the point-mass deflection M / (pi r) far outside', () => {
    // A bounded mass seen from afar (Schneider, Ehlers & Falco 1992, axially symmetric lenses):
    // total 2 pi sum a s^2 in Sigma_crit arcsec^2. At r = 2000 the quadrupole of the elliptical
    // mass changes size and direction by about (s/r)^2 (1/q - q) / 2 = 3e-7 (q = 0.6, s = 1.4);
    // 1e-6 allows that, not a wrong total (a 1% error in one amplitude shifts the size by 1e-2).
    const mass = 2 * Math.PI * (-0.2 * 0.35 ** 2 + 0.9 * 1.4 ** 2);
    const [ax, ay] = deflection(twoGaussians(), 0.6, 10, 0, 0, 1600, 1200);
    expect(Math.abs(Math.hypot(ax, ay) / (mass / (Math.PI * 2000)) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(ax * 1200 - ay * 1600) / (Math.hypot(ax, ay) * 2000)).toBeLessThan(1e-6);
  });

  it('kappa is half the divergence of alpha', () => {
    // Poisson equation of lensing by central differences, step 1e-4 arcsec: truncation
    // ~h^2 |alpha'''| ~ 1e-8 / s^2 relative; 1e-6 as in the other profile tests.
    const sum = twoGaussians(), h = 1e-4;
    for (const [x, y] of annulusPoints(20, 0.05, 4, 0.1, -0.2)) {
      const kappa = new Float64Array(1);
      addEllipticalGaussianSumConvergence(sum, 0.55, -20, 0.1, -0.2, Float64Array.of(x), Float64Array.of(y), 1, kappa);
      const divergence = (deflection(sum, 0.55, -20, 0.1, -0.2, x + h, y)[0] - deflection(sum, 0.55, -20, 0.1, -0.2, x - h, y)[0]
        + deflection(sum, 0.55, -20, 0.1, -0.2, x, y + h)[1] - deflection(sum, 0.55, -20, 0.1, -0.2, x, y - h)[1]) / (2 * h);
      expect(Math.abs(0.5 * divergence - kappa[0])).toBeLessThan(1e-6 * Math.abs(kappa[0]) + 1e-9);
    }
  });
});
