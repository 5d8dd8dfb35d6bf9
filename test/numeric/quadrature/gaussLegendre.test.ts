// Tests of src/numeric/quadrature/gaussLegendre.ts and adaptiveGaussLegendre.ts.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { gaussLegendre, integrateAdaptiveGaussLegendre } from '../../../src/numeric/index.js';

// Reference nodes and weights from numpy.polynomial.legendre.leggauss (make_gauss_legendre.py).
const fixture = JSON.parse(readFileSync(new URL('./fixtures/gauss_legendre.json', import.meta.url), 'utf8')) as {
  rules: Record<string, { nodes: number[]; weights: number[] }>;
};

describe('Gauss-Legendre rules', () => {
  for (const [order, rule] of Object.entries(fixture.rules)) {
    it(`order ${order} matches numpy's leggauss to 1e-14`, () => {
      // Both find the roots by Newton's method to double precision: nodes and weights agree to a
      // few units in the last place (1e-14 absolute leaves room for 64 points).
      const { nodes, weights } = gaussLegendre(Number(order));
      rule.nodes.forEach((x, i) => expect(Math.abs(nodes[i] - x)).toBeLessThan(1e-14));
      rule.weights.forEach((w, i) => expect(Math.abs(weights[i] - w)).toBeLessThan(1e-14));
    });
  }

  it('integrates polynomials of degree 2n - 1 exactly (Gauss 1814)', () => {
    // integral of x^k over [-1, 1] is 2/(k + 1) for even k, 0 for odd k.
    for (const order of [3, 7, 20]) {
      const { nodes, weights } = gaussLegendre(order);
      for (let k = 0; k <= 2 * order - 1; k++) {
        let sum = 0;
        nodes.forEach((x, i) => (sum += weights[i] * x ** k));
        expect(Math.abs(sum - (k % 2 === 0 ? 2 / (k + 1) : 0))).toBeLessThan(1e-14);
      }
    }
  });
});

describe('adaptive Gauss-Legendre quadrature', () => {
  it('meets the requested relative accuracy on closed-form integrals', () => {
    // Closed forms: integral of exp(-x^2) over [0, 3] = sqrt(pi)/2 erf(3) (erf(3) = 0.9999779095030014,
    // common practice); of 1/sqrt(x) over [1e-6, 1] = 2 - 2e-3; of sin over [0, pi] = 2.
    const cases: [(x: number) => number, number, number, number][] = [
      [(x) => Math.exp(-x * x), 0, 3, (Math.sqrt(Math.PI) / 2) * 0.9999779095030014],
      [(x) => 1 / Math.sqrt(x), 1e-6, 1, 2 - 2e-3],
      [Math.sin, 0, Math.PI, 2],
    ];
    for (const [f, a, b, exact] of cases) {
      expect(Math.abs(integrateAdaptiveGaussLegendre(f, a, b, 1e-10) / exact - 1)).toBeLessThan(1e-10);
    }
    expect(integrateAdaptiveGaussLegendre(Math.exp, 2, 2, 1e-10)).toBe(0);
  });
});
