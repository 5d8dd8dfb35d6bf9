import { describe, expect, it } from 'vitest';
import { lensingContext } from '../../src/cosmology/lensingContext.js';
import { defaultCosmology } from '../../src/cosmology/defaultCosmology.js';
import { pseudoJaffe } from '../../src/perturber/pseudoJaffe.js';
import { pseudoJaffeStrengthArcsec, pseudoJaffeTotalMassSolar } from '../../src/perturber/subhaloLensing.js';
import {
  annulusPoints, convergenceAt, deflectionAt, halfDivergence, potentialGradient, relativeVectorError,
} from '../lens/profileProbes.js';
import { integrateExpSinh } from './doubleExponential.js';
import {
  convergenceAtRadius, deflectionFromConvergence, radialDeflection, transverseToleranceFor, type RadialProbe,
} from './radialChecks.js';

const b = 0.12, cx = 0.4, cy = 0.25;

// Pseudo-Jaffe convergence as published (Keeton 2001; Elíasdóttir et al. 2007).
const publishedConvergence = (r: number, s: number, a: number): number =>
  0.5 * b * (1 / Math.hypot(s, r) - 1 / Math.hypot(a, r));

// The same, rewritten by 1/A - 1/B = (B^2 - A^2)/(A B (A + B)) to stay exact where r >> a
// (the exp-sinh mass integral reaches r ~ 1e30 a, where the published difference rounds to 0).
const convergenceFarSafe = (r: number, s: number, a: number): number => {
  const inner = Math.hypot(s, r), outer = Math.hypot(a, r);
  return (0.5 * b * (a - s) * (a + s)) / (inner * outer * (inner + outer));
};

for (const [s, a] of [[0, 0.3], [0.02, 0.5], [0.1, 0.11]] as const) {
  const p = Float64Array.of(b, s, a, cx, cy);
  const probe: RadialProbe = {
    profile: pseudoJaffe, p: Float64Array.of(b, s, a, 0, 0), centerX: 0, centerY: 0, directionRad: -1.1,
  };
  const transverseTolerance = transverseToleranceFor(probe);
  const radii = [1e-6, 1e-3, 0.5 * (s + 1e-3), s, a, 0.07, 0.4, 3, 50].filter((r) => r > 0);

  describe(`pseudo-Jaffe, core ${s}", truncation ${a}"`, () => {
    it('kappa is the published formula', () => {
      // The code uses an equal, cancellation-free form; the published difference of two terms
      // loses about (r^2 / (a^2 - s^2)) eps to cancellation, so the bound is 1e-14 times (1 + that).
      for (const r of radii) {
        const tolerance = 1e-14 * (1 + (r * r) / ((a - s) * (a + s)));
        expect(Math.abs(convergenceAtRadius(probe, r) / publishedConvergence(r, s, a) - 1), `r = ${r}`)
          .toBeLessThan(tolerance);
      }
    });

    it('alpha matches (2/r) int_0^r kappa r dr (axisymmetric lens)', () => {
      // Tanh-sinh split at s and a, asked 1e-13; 1e-10 relative.
      for (const r of radii) {
        const reference = deflectionFromConvergence(probe, r, [s, a]);
        const { radial, transverse } = radialDeflection(probe, r);
        expect(Math.abs(radial / reference - 1), `r = ${r}`).toBeLessThan(1e-10);
        expect(Math.abs(transverse / reference), `r = ${r}`).toBeLessThan(transverseTolerance(r));
      }
    });

    it('kappa equals half the divergence of alpha, alpha the gradient of psi', () => {
      // Central differences, step 1e-4 r (errors ~1e-8); 1e-6 relative.
      for (const [x, y] of annulusPoints(30, 0.01, 2, cx, cy)) {
        const h = 1e-4 * Math.hypot(x - cx, y - cy);
        const kappa = convergenceAt(pseudoJaffe, p, x, y);
        expect(Math.abs(halfDivergence(pseudoJaffe, p, x, y, h) / kappa - 1)).toBeLessThan(1e-6);
        expect(relativeVectorError(potentialGradient(pseudoJaffe, p, x, y, h), deflectionAt(pseudoJaffe, p, x, y)))
          .toBeLessThan(1e-6);
      }
    });

    it('total mass pi Sigma_crit b (a - s) matches 2 pi Sigma_crit int_0^inf kappa r dr', () => {
      // Exp-sinh over the published kappa in its far-safe form (asked 1e-13); 1e-10 relative.
      const context = lensingContext(defaultCosmology, 0.5, 2);
      const numerical = 2 * Math.PI * context.criticalSurfaceDensitySolarPerArcsec2 *
        integrateExpSinh((r) => convergenceFarSafe(r, s, a) * r, a);
      const closed = pseudoJaffeTotalMassSolar(b, s, a, context);
      expect(Math.abs(closed / numerical - 1)).toBeLessThan(1e-10);
      expect(Math.abs(pseudoJaffeStrengthArcsec(closed, s, a, context) / b - 1)).toBeLessThan(1e-14);
    });
  });
}

describe('pseudo-Jaffe limits', () => {
  it('without core and with a distant truncation it is the SIS: |alpha| = b', () => {
    // SIS deflection is the Einstein radius everywhere (Schneider, Ehlers & Falco 1992); with
    // a = 1e9 b the correction is r / a <= 1e-8 at r <= 10 b.
    const p = Float64Array.of(b, 0, 1e9 * b, cx, cy);
    for (const r of [0.01, 0.5, 1.2]) {
      const [ax, ay] = deflectionAt(pseudoJaffe, p, cx + r * 0.6, cy - r * 0.8);
      expect(Math.abs(Math.hypot(ax, ay) / b - 1)).toBeLessThan(1e-8);
    }
  });
  it('a coreless profile has zero deflection at its exact centre', () => {
    expect(deflectionAt(pseudoJaffe, Float64Array.of(b, 0, 0.3, cx, cy), cx, cy)).toEqual([0, 0]);
  });
});
