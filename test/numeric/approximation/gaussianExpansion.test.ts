import { describe, expect, it } from 'vitest';
import { fitGaussianExpansion, type GaussianExpansion } from '../../../src/numeric/approximation/gaussianExpansion.js';

function valueAt(expansion: GaussianExpansion, r: number): number {
  let sum = 0;
  for (let j = 0; j < expansion.widths.length; j++) {
    sum += expansion.amplitudes[j] * Math.exp((-0.5 * r * r) / (expansion.widths[j] * expansion.widths[j]));
  }
  return sum;
}

function worstRelativeError(expansion: GaussianExpansion, f: (r: number) => number, from: number, to: number): number {
  let worst = 0;
  for (let k = 0; k <= 2000; k++) {
    const r = from * Math.pow(to / from, k / 2000);
    worst = Math.max(worst, Math.abs(valueAt(expansion, r) / f(r) - 1));
  }
  return worst;
}

describe('fitGaussianExpansion', () => {
  it('reproduces a sum of Gaussians whose widths are on its grid', () => {
    // Three of the grid's own widths (0.3 * 10^(k/4)), one negative: the least-squares residual
    // is zero, so the fit must return the function to rounding times the singular-value cutoff.
    const options = { minRadius: 0.01, maxRadius: 10, widthsPerDecade: 4, floor: 1e-3 };
    const width = (k: number): number => 0.003 * Math.pow(20 / 0.003, k / (Math.ceil(Math.log10(20 / 0.003) * 4)));
    const f = (r: number): number => [[2, 1.5], [6, -0.3], [11, 0.8]].reduce(
      (sum, [k, a]) => sum + a * Math.exp((-0.5 * r * r) / (width(k) * width(k))), 0) + 1e-3;
    const expansion = fitGaussianExpansion((r) => f(r) - 1e-3, options);
    for (let k = 0; k <= 200; k++) {
      const r = 0.01 * Math.pow(1000, k / 200);
      expect(Math.abs(valueAt(expansion, r) - (f(r) - 1e-3)) / f(r)).toBeLessThan(1e-9);
    }
  });

  it('approximates 1/(1 + r^2) with the accuracy its width spacing allows', () => {
    // 1/(1 + r^2) = int_0^inf exp(-t) exp(-t r^2) dt is a continuous mixture of Gaussians, so a
    // discrete one on log-spaced widths converges geometrically with their density: measured
    // 1.8e-3, 4.1e-5 and 5.7e-7 at 4, 6 and 8 widths per decade over 0.01 <= r <= 100
    // (relative error, the fit's own measure). Each bound is 1.5 times the measurement, below
    // the next coarser spacing's error, so a fit that lost its accuracy would show.
    const lorentzian = (r: number): number => 1 / (1 + r * r);
    const bounds: Array<[number, number]> = [[4, 2.7e-3], [6, 6.2e-5], [8, 8.5e-7]];
    for (const [widthsPerDecade, bound] of bounds) {
      const expansion = fitGaussianExpansion(lorentzian, { minRadius: 0.01, maxRadius: 100, widthsPerDecade });
      expect(worstRelativeError(expansion, lorentzian, 0.01, 100)).toBeLessThan(bound);
    }
  });
});
