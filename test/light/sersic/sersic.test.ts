import { describe, expect, it } from 'vitest';
import gammainc from '@stdlib/math/base/special/gammainc';
import gamma from '@stdlib/math/base/special/gamma';
import { sersic } from '../../../src/light/sersic/sersic.js';
import { valueAt } from '../valueAt.js';
import { sersicCoefficient } from '../../../src/light/sersic/sersicCoefficient.js';
import { integrateOverEllipse } from '../ellipticalQuadrature.js';

const geometry = { axisRatio: 0.6, positionAngleDeg: 35, centerXArcsec: 0.3, centerYArcsec: -0.2 };
const effectiveRadius = 0.7;

function parameters(sersicIndex: number, g = geometry, radius = effectiveRadius): Float64Array {
  return Float64Array.of(radius, sersicIndex, g.axisRatio, g.positionAngleDeg, g.centerXArcsec, g.centerYArcsec);
}

describe('elliptical Sersic profile', () => {
  it('declares its parameters and one basis function', () => {
    expect(sersic.parameterNames).toEqual([
      'effectiveRadiusArcsec', 'sersicIndex', 'axisRatio', 'positionAngleDeg', 'centerXArcsec', 'centerYArcsec',
    ]);
    expect(sersic.basisCount).toBe(1);
  });

  // Quadrature: Simpson in ln R with 4000 steps per interval (error ~ h^4). Measured while
  // writing this test: the totals agree with the closed form to < 1e-10 (worst n = 0.3), and
  // 2000 steps differ from 4000 by < 1e-9, so 1e-9 bounds the quadrature error with room; a
  // wrong exponent, radius definition or b_n would miss by far more.
  for (const sersicIndex of [0.3, 0.5, 1, 2, 4, 8]) {
    it(`n = ${sersicIndex}: total flux and half-light fraction by numerical integration`, () => {
      const p = parameters(sersicIndex);
      const bn = sersicCoefficient(sersicIndex);
      const inner = integrateOverEllipse(sersic, p, geometry, 1e-10 * effectiveRadius, effectiveRadius, 4000, 8);
      const outer = integrateOverEllipse(sersic, p, geometry, effectiveRadius, 1e8 * effectiveRadius, 4000, 8);
      const total = inner + outer;
      // Graham & Driver 2005 (PASA 22, 118; journal checked, equation number not): L = 2 pi n
      // R_e^2 I_e e^b b^(-2n) Gamma(2n), which this numerical integration checks in turn.
      const closedForm = 2 * Math.PI * sersicIndex * effectiveRadius ** 2
        * Math.exp(bn) * Math.pow(bn, -2 * sersicIndex) * gamma(2 * sersicIndex);
      expect(Math.abs(total / closedForm - 1)).toBeLessThan(1e-9);
      // Fraction of light inside R_e: P(2n, b_n) (@stdlib/math gammainc), which is 1/2 for the
      // exact b_n; with eq. 18 of Ciotti & Bertin it is 1/2 to the expansion's accuracy
      // (measured |P - 1/2| = 1.3e-4 at n = 0.5, 6.6e-9 at n = 8).
      expect(Math.abs(inner / total - gammainc(bn, 2 * sersicIndex))).toBeLessThan(1e-9);
      expect(Math.abs(inner / total - 0.5)).toBeLessThan(sersicIndex < 0.36 ? 1e-9 : 1.5e-4);
    });
  }

  it('amplitude 1 means brightness 1 at the effective radius, e^(b_n) at the centre', () => {
    const p = parameters(4);
    expect(valueAt(sersic, p, geometry.centerXArcsec, geometry.centerYArcsec)).toBeCloseTo(Math.exp(sersicCoefficient(4)), 10);
  });

  it('position angle counter-clockwise from +x and centre: hand-computed points', () => {
    // q = 0.5, PA = 30 deg, centre (1, 2), R_e = 1, n = 1. A point at distance d from the centre
    // along the direction 30 deg (the major axis) has R = d sqrt(q); along 120 deg (minor axis)
    // R = d / sqrt(q). So d = sqrt(2) on the major axis and d = 1/sqrt(2) on the minor axis both
    // lie on the half-light isophote (I = 1), and d = 2 sqrt(2) on the major axis has R = 2,
    // I = exp(-b_1 (2 - 1)).
    const g = { axisRatio: 0.5, positionAngleDeg: 30, centerXArcsec: 1, centerYArcsec: 2 };
    const p = parameters(1, g, 1);
    const major = [Math.cos(Math.PI / 6), Math.sin(Math.PI / 6)];
    const minor = [-Math.sin(Math.PI / 6), Math.cos(Math.PI / 6)];
    const at = (d: number, axis: number[]) => valueAt(sersic, p, 1 + d * axis[0], 2 + d * axis[1]);
    expect(at(Math.SQRT2, major)).toBeCloseTo(1, 12);
    expect(at(-Math.SQRT2, major)).toBeCloseTo(1, 12);
    expect(at(Math.SQRT1_2, minor)).toBeCloseTo(1, 12);
    expect(at(2 * Math.SQRT2, major)).toBeCloseTo(Math.exp(-sersicCoefficient(1)), 12);
    // Mirror image across +x (the clockwise reading of the angle) is not on the isophote.
    expect(Math.abs(valueAt(sersic, p, 1 + Math.SQRT2 * major[0], 2 - Math.SQRT2 * major[1]) - 1)).toBeGreaterThan(0.1);
  });

  it('writes at outOffset and leaves the rest of the buffer alone', () => {
    const p = parameters(2);
    const out = new Float64Array(5).fill(-1);
    sersic.writeBasis(p, 0, Float64Array.of(0, 0.5), Float64Array.of(0, 0.1), 2, out, 2, 2);
    expect(out[0]).toBe(-1);
    expect(out[1]).toBe(-1);
    expect(out[2]).toBe(valueAt(sersic, p, 0, 0));
    expect(out[3]).toBe(valueAt(sersic, p, 0.5, 0.1));
    expect(out[4]).toBe(-1);
  });

  it('reads its parameters at an offset', () => {
    const p = parameters(2);
    const shifted = new Float64Array(9);
    shifted.set(p, 3);
    const out = new Float64Array(1);
    sersic.writeBasis(shifted, 3, Float64Array.of(0.4), Float64Array.of(0.2), 1, out, 0, 1);
    expect(out[0]).toBe(valueAt(sersic, p, 0.4, 0.2));
  });
});
