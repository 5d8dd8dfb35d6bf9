import { describe, expect, it } from 'vitest';
import { midpointStencilWeights, richardsonFactor } from '../../src/forward/midpointStencil.js';
import { EXTRAPOLATED_CONVERGENCE } from '../../src/forward/adaptivePixelMeans.js';

/** Mean of g over the m-point midpoint rule on [-1/2, 1/2] (the definition the model uses). */
function midpointMean(g: (t: number) => number, m: number): number {
  let sum = 0;
  for (let a = 0; a < m; a++) sum += g((a + 0.5) / m - 0.5);
  return sum / m;
}

/** Mean of g over the m x m midpoint rule on the unit pixel centred at the origin. */
function midpointMean2d(g: (x: number, y: number) => number, m: number): number {
  let sum = 0;
  for (let b = 0; b < m; b++) for (let a = 0; a < m; a++) sum += g((a + 0.5) / m - 0.5, (b + 0.5) / m - 0.5);
  return sum / (m * m);
}

describe('midpoint stencil weights', () => {
  it('reproduce the S-point midpoint mean of every polynomial up to degree 2 halfWidth from the values at the integers', () => {
    // Definition of an interpolatory quadrature by its moments (Davis & Rabinowitz, Methods of
    // Numerical Integration, 1984, sec. 2.5): exact for 1, t, ..., t^(2h).
    for (const [supersampling, halfWidth] of [[8, 1], [8, 2], [4, 2], [2, 1]]) {
      const w = midpointStencilWeights(supersampling, halfWidth);
      for (let degree = 0; degree <= 2 * halfWidth; degree++) {
        let predicted = 0;
        for (let k = -halfWidth; k <= halfWidth; k++) predicted += w[k + halfWidth] * k ** degree;
        expect(predicted).toBeCloseTo(midpointMean((t) => t ** degree, supersampling), 13);
      }
      // One degree more is not reproduced in general (degree 2h + 2, even): the check can fail.
      const degree = 2 * halfWidth + 2;
      let predicted = 0;
      for (let k = -halfWidth; k <= halfWidth; k++) predicted += w[k + halfWidth] * k ** degree;
      expect(Math.abs(predicted - midpointMean((t) => t ** degree, supersampling))).toBeGreaterThan(1e-3);
    }
  });
});

describe('Richardson extrapolation of the midpoint rule', () => {
  it('is exact for t^2, whose midpoint error is exactly c / m^2', () => {
    // The m-point midpoint mean of t^2 on [-1/2, 1/2] is 1/12 - 1/(12 m^2) (sum of squares,
    // common practice), so extrapolating from any m1 < m2 lands on the target's mean.
    const g = (t: number): number => t * t;
    for (const [m1, m2, target] of [[1, 2, 8], [2, 4, 8], [4, 8, 64]]) {
      const extrapolated = midpointMean(g, m2) + (midpointMean(g, m2) - midpointMean(g, m1)) * richardsonFactor(m1, m2, target);
      expect(extrapolated).toBeCloseTo(1 / 12 - 1 / (12 * target * target), 15);
    }
  });

  it(`on smooth light the m = 4 prediction errs at least ${EXTRAPOLATED_CONVERGENCE}-fold less than its change from the m = 2 prediction`, () => {
    // The midpoint rule's error runs in even powers of 1/m (Euler-Maclaurin; Davis & Rabinowitz
    // 1984, sec. 2.9), so after removing the 1/m^2 term the prediction errs as m^-4 towards the
    // S = 8 mean: 17-fold less at m = 4 than at m = 2. AdaptivePixelMeans relies on a factor
    // EXTRAPOLATED_CONVERGENCE. Light: elliptical Gaussians and a Sersic-like exponential whose
    // widths run from 0.7 to 3 pixels, offset from the pixel centre (no symmetry helps).
    const profiles: ((x: number, y: number) => number)[] = [];
    for (const width of [0.7, 1, 1.5, 3]) {
      profiles.push((x, y) => Math.exp(-((x - 0.31) ** 2 + 0.6 * (y + 0.17) ** 2) / (2 * width * width)));
      profiles.push((x, y) => Math.exp(-Math.sqrt((x - 1.3) ** 2 + (y - 0.4) ** 2 + 0.5) / width));
    }
    for (const g of profiles) {
      const exact = midpointMean2d(g, 8);
      const centre = g(0, 0);
      const mean2 = midpointMean2d(g, 2), mean4 = midpointMean2d(g, 4);
      const predicted2 = mean2 + (mean2 - centre) * richardsonFactor(1, 2, 8);
      const predicted4 = mean4 + (mean4 - mean2) * richardsonFactor(2, 4, 8);
      expect(Math.abs(predicted4 - predicted2)).toBeGreaterThan(EXTRAPOLATED_CONVERGENCE * Math.abs(predicted4 - exact));
    }
  });
});
