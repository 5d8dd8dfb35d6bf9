// Tests of src/results/significanceBound.ts.
import normalQuantile from '@stdlib/stats/base/dists/normal/quantile';
import { describe, expect, it } from 'vitest';
import {
  bayesFactorBoundFromPValue,
  lnPValueBound,
  significanceBound,
  twoSidedSigmaFromLnP,
} from '../../src/results/index.js';
import { readResultsFixture } from './fixtureFile.js';

interface SignificanceRow {
  lnBayesFactor10: number;
  lnPValue: number;
  sigma: number;
}

// Made by test/results/fixtures/make_significance.py with SciPy: ln p = W_{-1}(-exp(-1 - ln B10))
// (Lambert W, lower branch) or a fixed-point iteration where that underflows; sigma from ndtri_exp.
const fixture = readResultsFixture<{ rows: SignificanceRow[] }>('significance.json');

describe('bayesFactorBoundFromPValue', () => {
  it('gives the B(p) = -e p ln p column of Sellke, Bayarri & Berger 2001, Table 1', () => {
    // Their table, three figures: p = 0.05 -> 0.407, p = 0.01 -> 0.125, p = 0.001 -> 0.0188. The
    // paper was not reachable here; a reproduction of the table gives 0.407, 0.125 and 0.019.
    // Half a unit in the last figure allowed.
    expect(Math.abs(bayesFactorBoundFromPValue(0.05) - 0.407)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs(bayesFactorBoundFromPValue(0.01) - 0.125)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs(bayesFactorBoundFromPValue(0.001) - 0.0188)).toBeLessThanOrEqual(0.00005);
    // So p = 0.05 allows at most B10 = 1 / 0.4072 = 2.456.
    expect(1 / bayesFactorBoundFromPValue(0.05)).toBeCloseTo(2.456, 3);
    // Above 1/e the bound is 1 (no evidence against the null).
    expect(bayesFactorBoundFromPValue(0.5)).toBe(1);
  });

  it('gives the posterior probability bound of the null, (1 + 1/B)^-1, of the same table', () => {
    // Sellke et al. 2001, Table 1, alpha(p) for equal prior odds: 0.289, 0.111, 0.0184 (the same
    // reproduction gives 28.9%, 11.1% and 1.8%); half a unit in the last figure allowed.
    const posterior = (p: number): number => 1 / (1 + 1 / bayesFactorBoundFromPValue(p));
    expect(Math.abs(posterior(0.05) - 0.289)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs(posterior(0.01) - 0.111)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs(posterior(0.001) - 0.0184)).toBeLessThanOrEqual(0.00005);
  });
});

describe('lnPValueBound', () => {
  it('inverts the bound: p -> B10 = 1 / B(p) -> p, from p = 1e-300 to just below 1/e', () => {
    for (const p of [1e-300, 1e-100, 1e-20, 1e-7, 0.001, 0.01, 0.05, 0.2, 0.3, 0.36]) {
      const lnB10 = -Math.log(bayesFactorBoundFromPValue(p));
      // Bisection to the last bit of u = ln p; the round trip passes through ln of -e p ln p, so a
      // few ulps of ln p are allowed.
      expect(Math.abs(lnPValueBound(lnB10) - Math.log(p))).toBeLessThan(1e-13 * Math.max(1, -Math.log(p)));
    }
  });

  it('matches the Lambert-W solution from SciPy, far beyond the range of doubles', () => {
    for (const row of fixture.rows) {
      const lnP = lnPValueBound(row.lnBayesFactor10);
      // Both sides solve to the last bit or so (measured: at most 2e-16 relative, even near the
      // branch point at ln B10 = 0.01); 1e-14 relative allows a few ulps of platform libm.
      expect(Math.abs(lnP - row.lnPValue)).toBeLessThan(1e-14 * Math.abs(row.lnPValue));
    }
  });

  it('is NaN for B10 <= 1', () => {
    expect(lnPValueBound(0)).toBeNaN();
    expect(lnPValueBound(-3)).toBeNaN();
    expect(significanceBound(-3).sigma).toBeNaN();
    expect(significanceBound(0).reading).toBe('a Bayes factor of at most 1 carries no evidence against the null model');
  });
});

describe('twoSidedSigmaFromLnP and significanceBound', () => {
  it('gives the two-sided Gaussian sigma of a p-value (@stdlib/stats normal quantile)', () => {
    // p = 0.05 two-sided is 1.95996 sigma: Phi^-1(0.975).
    expect(twoSidedSigmaFromLnP(Math.log(0.05))).toBeCloseTo(normalQuantile(0.975, 0, 1), 12);
    expect(twoSidedSigmaFromLnP(Math.log(2.699796e-3))).toBeCloseTo(3, 6);
  });

  it('matches SciPy ndtri_exp on both sides of the switch to the tail formula (ln p = -700)', () => {
    for (const row of fixture.rows) {
      const sigma = significanceBound(row.lnBayesFactor10).sigma;
      // Measured: 1e-15 relative or better except just above ln p = -700, where erfcinv of a
      // p-value near 1e-300 is good to 8e-14 relative; 1e-12 relative allowed.
      expect(Math.abs(sigma - row.sigma)).toBeLessThan(1e-12 * row.sigma);
    }
    expect(twoSidedSigmaFromLnP(-700 + 1e-9)).toBeCloseTo(twoSidedSigmaFromLnP(-700 - 1e-9), 9);
  });

  it('reads a Bayes factor as at most a p-value and its sigma', () => {
    // B10 = 1 / 0.4072 (p = 0.05 in Sellke et al.'s Table 1) is at most as significant as p = 0.05.
    const bound = significanceBound(-Math.log(bayesFactorBoundFromPValue(0.05)));
    expect(bound.pValue).toBeCloseTo(0.05, 13);
    expect(bound.reading).toBe('at most as significant as a p-value of 0.050 (2.0 sigma, two-sided)');
    const huge = significanceBound(1000);
    expect(huge.pValue).toBe(0);
    expect(huge.reading).toMatch(/^at most as significant as a p-value of exp\(-1007\.\d+\) \(44\.\d sigma, two-sided\)$/);
  });
});
