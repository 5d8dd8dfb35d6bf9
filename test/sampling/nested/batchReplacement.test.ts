import { describe, expect, it } from 'vitest';
import { logSumExp } from '../../../src/numeric/statistics/logSumExp.js';
import type { NestedProblem } from '../../../src/sampling/nested/nestedProblem.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';

// A normalised 5-D Gaussian, sigma 0.05, centred in the unit cube: 10 sigma from every face, so
// ln Z = 0 (closed form) and the information H ~ 7.9 nats makes the shrinkage accounting matter.
const dim = 5;
const sigma = 0.05;
const gaussian: NestedProblem = {
  dim,
  physicalDim: dim,
  transform(unit, out) {
    out.set(unit);
  },
  logLikelihood(points, count) {
    const lnL = new Float64Array(count);
    for (let n = 0; n < count; n++) {
      let sum = 0;
      for (let i = 0; i < dim; i++) sum += ((points[n * dim + i] - 0.5) / sigma) ** 2;
      lnL[n] = -0.5 * sum - dim * Math.log(sigma * Math.sqrt(2 * Math.PI));
    }
    return lnL;
  },
};

describe('replacing k live points per step', () => {
  it('k = 40 of N = 200 gives the same ln Z as k = 1, and a naive 1/N per point would not', async () => {
    const calls: number[] = [];
    const batched: NestedProblem = {
      ...gaussian,
      logLikelihood(points, count) {
        calls.push(count);
        return gaussian.logLikelihood(points, count);
      },
    };
    const single = await runNested(gaussian, { livePoints: 200, seed: 8, replacementsPerStep: 1, evidence: 'nested' });
    const many = await runNested(batched, { livePoints: 200, seed: 8, replacementsPerStep: 40, evidence: 'nested' });
    for (const result of [single, many]) expect(Math.abs(result.lnZ)).toBeLessThan(3 * result.lnZError);
    expect(Math.abs(single.lnZ - many.lnZ)).toBeLessThan(3 * Math.hypot(single.lnZError, many.lnZError));
    // Every step's candidates went out in batches of at least k (ellipsoid batches are sized by
    // the acceptance rate; only a step's follow-up batch may be smaller).
    expect(Math.max(...calls)).toBeGreaterThanOrEqual(40);
    // The order-statistics accounting matters: the same points weighted with ln X dropping by a
    // flat 1/N per removed point (wrong for batches) miss the truth by more than 3 errors.
    const dead = many.iterations;
    const naive = new Float64Array(many.count);
    for (let i = 0; i < dead; i++) naive[i] = many.lnL[i] + Math.log(Math.exp(-i / 200) - Math.exp(-(i + 1) / 200));
    for (let i = dead; i < many.count; i++) naive[i] = many.lnL[i] - dead / 200 - Math.log(200);
    expect(Math.abs(logSumExp(naive))).toBeGreaterThan(3 * many.lnZError);
  });
});
