import { describe, expect, it } from 'vitest';
import gammainc from '@stdlib/math/base/special/gammainc';
import {
  SERSIC_EXPANSION_MIN_INDEX, sersicCoefficient, sersicCoefficientExact, sersicCoefficientExpansion,
} from '../../../src/light/sersic/sersicCoefficient.js';

// The exact b_n: root of P(2n, b) = 1/2 (Ciotti 1991; Graham & Driver 2005), P the regularised
// lower incomplete gamma function of @stdlib/math (a general-purpose reference library; note its
// argument order gammainc(x, a)), found here by plain bisection on 0 < b < 2n (the median of a
// gamma distribution lies below its mean, Chen & Rubin 1986), independent of the code under test.
function exactRootByBisection(sersicIndex: number): number {
  let low = 0;
  let high = 2 * sersicIndex;
  for (let iteration = 0; iteration < 200; iteration++) {
    const middle = 0.5 * (low + high);
    if (gammainc(middle, 2 * sersicIndex) < 0.5) low = middle;
    else high = middle;
  }
  return 0.5 * (low + high);
}

describe('Sersic coefficient b_n', () => {
  it('n = 1/2 gives b = ln 2 (P(1, b) = 1 - e^-b, closed form)', () => {
    expect(sersicCoefficientExact(0.5)).toBeCloseTo(Math.LN2, 14);
  });

  it('n = 1 gives the root of 1 - (1 + b) e^-b = 1/2 (P(2, b) closed form)', () => {
    // Newton on the closed form, independent of any incomplete-gamma code.
    let b = 1.7;
    for (let k = 0; k < 50; k++) b -= (1 - (1 + b) * Math.exp(-b) - 0.5) / (b * Math.exp(-b));
    expect(Math.abs(sersicCoefficientExact(1) - b)).toBeLessThan(1e-14);
    expect(Math.abs(sersicCoefficient(1) - b) / b).toBeLessThan(3e-5);
  });

  it('the exact root agrees with bisection on @stdlib gammainc for n in [0.1, 8]', () => {
    for (let n = 0.1; n <= 8.0001; n += 0.1) {
      const reference = exactRootByBisection(n);
      // Bisection to the last bit leaves ~1e-15 relative; 1e-13 allows gammainc's own rounding.
      expect(Math.abs(sersicCoefficientExact(n) - reference) / reference).toBeLessThan(1e-13);
    }
  });

  it('eq. 18 of Ciotti & Bertin (1999) meets its documented accuracy on [0.5, 8]', () => {
    // Bounds: the accuracy stated in src/light/sersic/sersicCoefficient.ts (rounded up).
    // A typo in any coefficient of eq. 18 moves the error by orders of magnitude.
    const bounds: Array<[number, number]> = [[0.5, 4e-4], [1, 3e-5], [2, 1.5e-6], [4, 8e-8], [8, 5e-9]];
    let worst = 0;
    for (let n = 0.5; n <= 8.0001; n += 0.05) {
      const reference = exactRootByBisection(n);
      const relativeError = Math.abs(sersicCoefficientExpansion(n) - reference) / reference;
      worst = Math.max(worst, relativeError);
      for (const [from, bound] of bounds) if (n >= from - 1e-9) expect(relativeError).toBeLessThan(bound);
    }
    expect(worst).toBeGreaterThan(1e-4); // the expansion really is approximate at n = 0.5
  });

  it('below n = 0.36 the exact root is used (the expansion is off by 2e-3 at n = 0.3)', () => {
    for (const n of [0.05, 0.2, 0.3, 0.35]) {
      expect(n).toBeLessThan(SERSIC_EXPANSION_MIN_INDEX);
      const reference = exactRootByBisection(n);
      expect(Math.abs(sersicCoefficient(n) - reference) / reference).toBeLessThan(1e-13);
    }
    const at03 = exactRootByBisection(0.3);
    expect(Math.abs(sersicCoefficientExpansion(0.3) - at03) / at03).toBeGreaterThan(1e-3);
    // Alternating calls defeat the one-entry cache and must still give the right root.
    expect(sersicCoefficient(0.2)).toBe(sersicCoefficientExact(0.2));
    expect(sersicCoefficient(0.3)).toBe(sersicCoefficientExact(0.3));
    expect(sersicCoefficient(0.2)).toBe(sersicCoefficientExact(0.2));
  });
});
