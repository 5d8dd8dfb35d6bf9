import { describe, expect, it } from 'vitest';
import type { NestedProblem } from '../../../src/sampling/nested/nestedProblem.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';

// A wrapped normal on the periodic unit coordinate u0 (mean 0, sigma 0.05: its mass sits on both
// sides of the seam u0 = 0 = 1) times a normal on u1 (mean 0.5, sigma 0.05, 10 sigma from the
// edges). The wrapped normal integrates to 1 over one period, so ln Z = 0 (closed form); its
// circular moment is E[cos 2 pi u0] = exp(-2 pi^2 sigma^2) (Mardia & Jupp 2000, Section 3.5.7).
const sigma = 0.05;
const wrapped: NestedProblem = {
  dim: 2,
  physicalDim: 2,
  periodic: [true, false],
  transform(unit, out) {
    out.set(unit);
  },
  logLikelihood(points, count) {
    const lnL = new Float64Array(count);
    const lnNormalisation = -Math.log(2 * Math.PI * sigma * sigma);
    for (let n = 0; n < count; n++) {
      let images = 0;
      for (let k = -2; k <= 2; k++) images += Math.exp(-0.5 * ((points[2 * n] + k) / sigma) ** 2);
      lnL[n] = lnNormalisation + Math.log(images) - 0.5 * ((points[2 * n + 1] - 0.5) / sigma) ** 2;
    }
    return lnL;
  },
};

describe('periodic coordinates', () => {
  it('slice sampling wraps across the seam: ln Z = 0 and the circular moment of u0', async () => {
    const result = await runNested(wrapped, { livePoints: 200, seed: 6, method: 'slice', evidence: 'nested' });
    expect(Math.abs(result.lnZ)).toBeLessThan(3 * result.lnZError);
    for (let i = 0; i < result.count; i++) {
      expect(result.unitPoints[2 * i]).toBeGreaterThanOrEqual(0);
      expect(result.unitPoints[2 * i]).toBeLessThan(1);
    }
    const samples = result.equalWeight();
    const n = samples.length / 2;
    let cosine = 0;
    let below = 0;
    for (let s = 0; s < n; s++) {
      cosine += Math.cos(2 * Math.PI * samples[2 * s]) / n;
      if (samples[2 * s] < 0.5) below++;
    }
    const expected = Math.exp(-2 * Math.PI ** 2 * sigma ** 2);
    // Var cos(2 pi u0) = (1 + e^{-8 pi^2 sigma^2}) / 2 - e^{-4 pi^2 sigma^2} for a wrapped normal;
    // 4 standard errors of the mean of n draws. Both sides of the seam hold half the mass.
    const variance = (1 + Math.exp(-8 * Math.PI ** 2 * sigma ** 2)) / 2 - expected ** 2;
    expect(Math.abs(cosine - expected)).toBeLessThan(4 * Math.sqrt(variance / n));
    expect(Math.abs(below / n - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / n));
  });
});
