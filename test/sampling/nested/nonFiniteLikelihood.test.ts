import { describe, expect, it } from 'vitest';
import type { NestedProblem } from '../../../src/sampling/nested/nestedProblem.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';

// A 2-D normalised Gaussian (mean (-2, 0), sigma 0.5) in the uniform box [-5, 5]^2, whose
// likelihood answers NaN for x > 1, +Infinity for y > 3, -Infinity for x < -4.5: together about
// half the prior. Those regions lie at least 5 sigma from the mean (posterior mass below 1e-6),
// so the evidence is that of the Gaussian alone, ln Z = -ln(100) (closed form). Treating +Infinity
// as a likelihood, or any impossible point as a live point, would break the estimate.
const sigma = 0.5;
const center = [-2, 0];

function problem(): NestedProblem {
  return {
    dim: 2,
    physicalDim: 2,
    transform(unit, out) {
      out[0] = 10 * unit[0] - 5;
      out[1] = 10 * unit[1] - 5;
    },
    logLikelihood(points, count) {
      const lnL = new Float64Array(count);
      for (let n = 0; n < count; n++) {
        const x = points[2 * n];
        const y = points[2 * n + 1];
        if (x > 1) lnL[n] = NaN;
        else if (y > 3) lnL[n] = Infinity;
        else if (x < -4.5) lnL[n] = -Infinity;
        else {
          const u = (x - center[0]) / sigma;
          const v = (y - center[1]) / sigma;
          lnL[n] = -0.5 * (u * u + v * v) - Math.log(2 * Math.PI * sigma * sigma);
        }
      }
      return lnL;
    },
  };
}

describe('non-finite likelihood values', () => {
  it('are counted, never enter the sums, and leave ln Z unbiased', async () => {
    const result = await runNested(problem(), { livePoints: 300, seed: 17, method: 'ellipsoids', evidence: 'nested' });
    expect(result.nonFiniteCount).toBeGreaterThan(100);
    for (let i = 0; i < result.count; i++) {
      expect(Number.isFinite(result.lnL[i])).toBe(true);
      expect(Number.isFinite(result.lnWeight[i])).toBe(true);
    }
    // lnZError includes the binomial error of the finite fraction of the prior (about half).
    expect(Math.abs(result.lnZ - -Math.log(100))).toBeLessThan(3 * result.lnZError);
  });

  it('slice sampling treats them as outside the contour too', async () => {
    const result = await runNested(problem(), { livePoints: 200, seed: 4, method: 'slice', evidence: 'nested' });
    expect(result.nonFiniteCount).toBeGreaterThan(0);
    expect(Math.abs(result.lnZ - -Math.log(100))).toBeLessThan(3 * result.lnZError);
  });
});
