import { describe, expect, it } from 'vitest';
import { generalisedNfwConvergenceShape } from '../../../src/lens/darkHalo/generalisedNfwProjection.js';
import { generalisedNfwEnclosedMassFactor } from '../../../src/lens/darkHalo/generalisedNfwEnclosedMass.js';
import { nfwConvergenceShape } from '../../../src/lens/darkHalo/nfwProjection.js';
import { profileFixtures } from '../profileFixtures.js';

describe('generalised NFW projection', () => {
  it('matches scipy quad of the density along the line of sight', () => {
    // fixtures/make_profiles.py (quad asked 1e-13 relative); the trapezoidal rule's bound is
    // 7e-18, so 1e-11 allows for rounding in some hundred terms and quad's own error.
    for (const [gamma, bigX, reference] of profileFixtures.gnfwConvergence) {
      expect(Math.abs(generalisedNfwConvergenceShape(bigX, gamma) / reference - 1)).toBeLessThan(1e-11);
    }
  });
  it('is the NFW projection at gamma = 1', () => {
    // Bartelmann 1996: kappa / kappa_s = 2 (1 - F(X)) / (X^2 - 1), nfwProjection.ts (itself tested
    // against the projected density in test/perturber/nfw.test.ts).
    for (const bigX of [1e-4, 0.01, 0.5, 0.999, 1, 1.3, 7, 300]) {
      expect(Math.abs(generalisedNfwConvergenceShape(bigX, 1) / (2 * nfwConvergenceShape(bigX)) - 1)).toBeLessThan(1e-13);
    }
  });
});

describe('generalised NFW enclosed mass', () => {
  it('matches quad and the hypergeometric closed form', () => {
    // x^a/a 2F1(a, a; a + 1; -x) from scipy.special.hyp2f1 and quad of the integrand
    // (fixtures/make_profiles.py), which agree to 6e-15. Series and Gauss-Legendre pieces are
    // good to rounding; 1e-13 relative.
    for (const [gamma, x, numerical, closed] of profileFixtures.gnfwEnclosedMass) {
      const found = generalisedNfwEnclosedMassFactor(x, gamma);
      expect(Math.abs(found / numerical - 1)).toBeLessThan(1e-13);
      expect(Math.abs(found / closed - 1)).toBeLessThan(1e-13);
    }
  });
  it('is the NFW mass ln(1 + x) - x / (1 + x) at gamma = 1 on both sides of x = 1', () => {
    // Navarro, Frenk & White 1996; x = 1 is where the method changes (T = 1/2).
    for (const x of [1e-3, 0.5, 1 - 1e-12, 1, 1 + 1e-12, 3, 1e4]) {
      const nfw = Math.log1p(x) - x / (1 + x);
      expect(Math.abs(generalisedNfwEnclosedMassFactor(x, 1) / nfw - 1)).toBeLessThan(1e-12);
    }
  });
});
