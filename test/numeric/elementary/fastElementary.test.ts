import { describe, expect, it } from 'vitest';
import { fastExp } from '../../../src/numeric/elementary/fastExp.js';
import { fastAtan, fastAtanh } from '../../../src/numeric/elementary/fastAtan.js';
import { fastLog } from '../../../src/numeric/elementary/fastLog.js';
import { PowerTable } from '../../../src/numeric/elementary/powerTable.js';
import { uniformSequence } from '../../support/uniformSequence.js';

describe('fast elementary functions', () => {
  it('fastExp agrees with Math.exp to 3.7e-11 + 2.3e-16 |x| relative on [-708, 709], and is Math.exp outside', () => {
    // Reference: Math.exp (correctly rounded or within 1 ulp in V8's fdlibm port). The bound of
    // fastExp.ts: truncation of the cubic 3.7e-11 (|r| <= ln2/128), the one-part reduction
    // 2.2e-16 |x| and a few roundings of 1.1e-16, which the margin up to 3.7e-11 covers.
    const next = uniformSequence(7);
    let worst = 0;
    for (let k = 0; k < 200000; k++) {
      const x = -708 + 1417 * next();
      worst = Math.max(worst, Math.abs(fastExp(x) - Math.exp(x)) / Math.exp(x) / (3.7e-11 + 2.3e-16 * Math.abs(x)));
    }
    for (let k = 0; k < 20000; k++) {
      const x = (next() - 0.5) * 1e-6;
      worst = Math.max(worst, Math.abs(fastExp(x) - Math.exp(x)) / Math.exp(x) / 3.7e-11);
    }
    expect(worst).toBeLessThan(1);
    expect(fastExp(0)).toBe(1);
    expect(fastExp(-741)).toBe(Math.exp(-741));
    expect(fastExp(Number.NEGATIVE_INFINITY)).toBe(0);
    expect(fastExp(Number.NaN)).toBeNaN();
    expect(fastExp(710)).toBe(Math.exp(710));
  });

  it('fastLog agrees with Math.log to 4e-16 (1 + |ln x|) absolute over the doubles, and is Math.log outside', () => {
    // Reference: Math.log (fdlibm port, within 1 ulp). The bound of fastLog.ts: truncation
    // 2.1e-18, the rounding of r and of the tables, and a final rounding (1.1e-16 relative).
    // Points: log-uniform over the normal doubles, and close to 1 on both sides, where ln x is
    // small and only the absolute error is small.
    const next = uniformSequence(13);
    let worst = 0;
    const check = (x: number): void => {
      const exact = Math.log(x);
      worst = Math.max(worst, Math.abs(fastLog(x) - exact) / (1 + Math.abs(exact)));
    };
    for (let k = 0; k < 200000; k++) check(Math.exp(-708 + 1417 * next()));
    for (let k = 0; k < 100000; k++) check(1 + (next() - 0.5) * 1e-3);
    for (let k = 0; k < 100000; k++) check(0.01 + 10 * next());
    expect(worst).toBeLessThan(4e-16);
    expect(fastLog(1)).toBe(0);
    expect(fastLog(2)).toBe(Math.LN2);
    expect(fastLog(0)).toBe(Number.NEGATIVE_INFINITY);
    expect(fastLog(5e-324)).toBe(Math.log(5e-324));
    expect(fastLog(-1)).toBeNaN();
    expect(fastLog(Number.NaN)).toBeNaN();
    expect(fastLog(Number.POSITIVE_INFINITY)).toBe(Number.POSITIVE_INFINITY);
  });

  it('PowerTable agrees with Math.pow to T(h) + 2.2e-16 (1.5 |h ln x| + 8) relative, and is Math.pow outside its range', () => {
    // Reference: Math.pow (V8: within 1 ulp). The bound of powerTable.ts: table entries rounded
    // once after an argument h k ln2 with two roundings, the series' Lagrange remainder T(h)
    // (Abramowitz & Stegun 1964, 3.6.8 with 3.6.9's remainder form), and the roundings of three
    // products. Exponents: the demo source (n = 1.3), n = 0.5, 4, 8, 1/14.
    const next = uniformSequence(19);
    const table = new PowerTable();
    let worst = 0;
    for (const h of [0.5 / 1.3, 1, 0.125, 1 / 16, 7]) {
      expect(table.setExponent(h)).toBe(true);
      const values = Float64Array.from({ length: 100000 }, () => Math.exp((next() - 0.5) * 2 * 69)); // 2^-99.5 .. 2^99.5
      const powers = Float64Array.from(values);
      table.powerInPlace(powers, 0, powers.length);
      values.forEach((x, k) => {
        const exact = Math.pow(x, h);
        const bound = PowerTable.truncationBound(h) + 2.2e-16 * (1.5 * Math.abs(h * Math.log(x)) + 8);
        worst = Math.max(worst, Math.abs(powers[k] - exact) / exact / bound);
      });
      const special = Float64Array.of(0, 1e40, 1, 1e-40);
      table.powerInPlace(special, 0, 4);
      expect(Array.from(special)).toEqual([0, Math.pow(1e40, h), 1, Math.pow(1e-40, h)]);
    }
    expect(worst).toBeLessThan(1);
    expect(PowerTable.truncationBound(7)).toBeLessThan(8.3e-9);
    for (let h = 0.01; h <= 1; h += 0.01) expect(PowerTable.truncationBound(h)).toBeLessThan(1.0e-11);
    expect(table.setExponent(0)).toBe(false);
    expect(table.setExponent(7.5)).toBe(false);
  });

  it('fastAtan agrees with Math.atan to 1e-15 relative, fastAtanh with Math.atanh to 1e-15 absolute', () => {
    // Reference: Math.atan, Math.atanh (fdlibm ports, within 1 ulp). fastAtan: truncation
    // 1.2e-20 plus roundings; fastAtanh = ln((1+z)/(1-z))/2 has an absolute error of a few
    // 1e-16 (its relative error grows as z -> 0, which the deflection does not feel).
    const next = uniformSequence(5);
    let worstAtan = 0;
    let worstAtanh = 0;
    for (let k = 0; k < 200000; k++) {
      const x = Math.tan((next() - 0.5) * 3.14159);
      worstAtan = Math.max(worstAtan, Math.abs(fastAtan(x) - Math.atan(x)) / Math.max(Math.abs(Math.atan(x)), 1e-300));
      const z = (2 * next() - 1) * 0.999;
      worstAtanh = Math.max(worstAtanh, Math.abs(fastAtanh(z) - Math.atanh(z)));
    }
    expect(worstAtan).toBeLessThan(1e-15);
    expect(worstAtanh).toBeLessThan(1e-15);
    expect(fastAtan(0)).toBe(0);
    expect(fastAtan(1)).toBeCloseTo(Math.PI / 4, 15);
    expect(fastAtan(-1e300)).toBeCloseTo(-Math.PI / 2, 15);
    expect(fastAtan(Number.NaN)).toBeNaN();
  });

  it('fastAtanh agrees with Math.atanh to 1e-15 relative for |z| <= 7/8 (its table branch)', () => {
    // Reference: Math.atanh (fdlibm port, within 1 ulp). Bound stated in fastAtan.ts: truncation
    // 2e-19 relative plus a few roundings; points on and next to the table points and its end.
    const next = uniformSequence(11);
    let worst = 0;
    const check = (z: number): void => {
      worst = Math.max(worst, Math.abs(fastAtanh(z) - Math.atanh(z)) / Math.abs(Math.atanh(z)));
    };
    for (let k = 0; k < 200000; k++) check((2 * next() - 1) * 0.875);
    for (let j = 1; j <= 112; j++) for (const z of [j / 128, j / 128 - 1 / 256, j / 128 + 1 / 256 - 1e-17]) check(Math.min(z, 0.875));
    for (const z of [1e-300, 1e-12, 1e-5, 0.875]) {
      check(z);
      check(-z);
    }
    expect(worst).toBeLessThan(1e-15);
    expect(fastAtanh(0)).toBe(0);
    expect(fastAtanh(Number.NaN)).toBeNaN();
  });

});
