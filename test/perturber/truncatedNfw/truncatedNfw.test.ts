import { describe, expect, it } from 'vitest';
import { truncatedNfw } from '../../../src/perturber/truncatedNfw/truncatedNfw.js';
import { truncatedNfwTotalMassFactor } from '../../../src/perturber/subhaloLensing.js';
import {
  annulusPoints, convergenceAt, deflectionAt, halfDivergence,
} from '../../lens/profileProbes.js';
import { integrateExpSinh } from '../doubleExponential.js';
import {
  convergenceAtRadius, deflectionFromConvergence, radialDeflection, transverseToleranceFor, type RadialProbe,
} from '../radialChecks.js';

const kappaS = 0.31, thetaS = 0.45, cx = -0.37, cy = 0.08;

// Truncated NFW density in units of rho_s (Baltz, Marshall & Oguri 2009, n = 1), u = r / r_s.
const truncatedDensity = (u: number, tau: number): number =>
  (1 / (u * (1 + u) * (1 + u))) * ((tau * tau) / (tau * tau + u * u));

// Radii in units of r_s: the centre, both sides of the change of form at x = 1/2, the series
// switch around x = 1, x = 1, x = tau and its neighbours, and the outskirts.
function radiiFor(tau: number): number[] {
  return [
    1e-6, 1e-3, 0.05, 0.4, 0.5 - 1e-9, 0.5, 0.9, Math.sqrt(0.98) + 1e-9, 1 - 1e-7, 1, 1 + 1e-7, Math.sqrt(1.02) - 1e-9,
    1.7, tau * (1 - 1e-7), tau, tau * (1 + 1e-7), 3 * tau, 40,
  ];
}

for (const tau of [0.5, 1, 3, 15]) {
  const p = Float64Array.of(kappaS, thetaS, tau, cx, cy);
  const probe: RadialProbe = {
    profile: truncatedNfw, p: Float64Array.of(kappaS, thetaS, tau, 0, 0), centerX: 0, centerY: 0, directionRad: 2.2,
  };
  const transverseTolerance = transverseToleranceFor(probe);

  describe(`truncated NFW, tau = ${tau}`, () => {
    it('kappa matches the line-of-sight projection of the 3-D density', () => {
      // kappa = 2 kappa_s int_0^inf rho(sqrt(x^2 + z^2))/rho_s dz (exp-sinh, asked 1e-13); 1e-10 relative.
      for (const xr of radiiFor(tau)) {
        const reference = 2 * kappaS *
          integrateExpSinh((z) => truncatedDensity(Math.hypot(xr, z), tau), Math.max(xr, 1e-3));
        expect(Math.abs(convergenceAtRadius(probe, xr * thetaS) / reference - 1), `x = ${xr}`).toBeLessThan(1e-10);
      }
    });

    it('alpha matches (2/r) int_0^r kappa r dr (axisymmetric lens)', () => {
      // Tanh-sinh split at r_s and r_t, both asked 1e-13; 1e-10 relative.
      for (const xr of radiiFor(tau)) {
        const radius = xr * thetaS;
        const reference = deflectionFromConvergence(probe, radius, [thetaS, tau * thetaS]);
        const { radial, transverse } = radialDeflection(probe, radius);
        expect(Math.abs(radial / reference - 1), `x = ${xr}`).toBeLessThan(1e-10);
        expect(Math.abs(transverse / reference), `x = ${xr}`).toBeLessThan(transverseTolerance(radius));
      }
    });

    it('kappa equals half the divergence of alpha', () => {
      // Step 1e-4 r: truncation ~(1e-4)^2, rounding ~1e-12 relative; 1e-6 as for the NFW.
      for (const [x, y] of annulusPoints(30, 0.03 * thetaS, 6 * thetaS, cx, cy)) {
        const h = 1e-4 * Math.hypot(x - cx, y - cy);
        const kappa = convergenceAt(truncatedNfw, p, x, y);
        expect(Math.abs(halfDivergence(truncatedNfw, p, x, y, h) / kappa - 1)).toBeLessThan(1e-6);
      }
    });

    it('total mass: the closed form against integrating the 3-D density to infinity', () => {
      // M / (4 pi rho_s r_s^3) = int_0^inf rho/rho_s u^2 du (exp-sinh, asked 1e-13); 1e-11 relative.
      const reference = integrateExpSinh((u) => truncatedDensity(u, tau) * u * u, 1);
      expect(Math.abs(truncatedNfwTotalMassFactor(tau) / reference - 1)).toBeLessThan(1e-11);
    });

    it('the projected mass r alpha(r) / (4 kappa_s theta_s^2) tends to that total', () => {
      // At r = 1e6 r_s the mass outside, ~ tau^2 / x^2 of the total, is below 3e-10; the far-field
      // deflection loses ~x eps = 1e-10 to cancellation: 1e-8 relative covers both.
      const radius = 1e6 * thetaS;
      const [ax, ay] = deflectionAt(truncatedNfw, p, cx + radius, cy);
      const massFactor = (radius * Math.hypot(ax, ay)) / (4 * kappaS * thetaS * thetaS);
      expect(Math.abs(massFactor / truncatedNfwTotalMassFactor(tau) - 1)).toBeLessThan(1e-8);
    });
  });
}

describe('truncated NFW at its centre', () => {
  it('has zero deflection and a finite convergence', () => {
    const p = Float64Array.of(kappaS, thetaS, 2, cx, cy);
    expect(deflectionAt(truncatedNfw, p, cx, cy)).toEqual([0, 0]);
    expect(Number.isFinite(convergenceAt(truncatedNfw, p, cx, cy))).toBe(true);
  });
});
