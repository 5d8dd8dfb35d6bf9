import { describe, expect, it } from 'vitest';
import { evidenceTrace } from '../../src/results/evidenceTrace.js';

// A nested-sampling run laid out by hand (Skilling 2006: Z = integral of L dX over the enclosed
// prior volume X): dead points at X_i = exp(-i / N), then N final live points sharing X_M; for
// L(X) = exp(-X / s) the evidence enclosed below volume X is the closed form
// integral_X^1 exp(-x / s) dx = s (exp(-X / s) - exp(-1 / s)).
describe('evidence history rebuilt from the posterior weights', () => {
  const N = 4000;
  const M = 40_000;
  const s = 0.01;
  const likelihood = (x: number): number => Math.exp(-x / s);
  const lnL: number[] = [];
  const dX: number[] = [];
  const X: number[] = [];
  for (let i = 1; i <= M; i++) {
    const x = Math.exp(-i / N);
    X.push(x);
    dX.push(Math.exp(-(i - 1) / N) - x);
    lnL.push(Math.log(likelihood(x)));
  }
  for (let k = 0; k < N; k++) {
    const x = X[M - 1] * (1 - (k + 0.5) / N);
    lnL.push(Math.log(likelihood(x)));
    dX.push(X[M - 1] / N);
  }
  const Z = lnL.reduce((sum, l, i) => sum + Math.exp(l) * dX[i], 0);
  const lnZ = Math.log(Z);
  const lnW = lnL.map((l, i) => l + Math.log(dX[i]) - lnZ);
  const trace = evidenceTrace(lnW, lnL, lnZ);

  it('ends at the run\'s ln Z and recovers each dead point\'s enclosed volume ln X_i = -i / N', () => {
    expect(trace.accumulatedLnZ[trace.accumulatedLnZ.length - 1]).toBeCloseTo(lnZ, 12);
    for (const i of [1, 10, 1000, 20_000, M - 1]) expect(trace.lnX[i - 1]).toBeCloseTo(-i / N, 9);
    expect(trace.lnX[lnL.length - 1]).toBe(-Infinity);
  });

  it('follows the closed-form enclosed evidence s (exp(-X/s) - exp(-1/s)) to the quadrature error', () => {
    // Each rectangle takes L at its inner edge; across one step L changes by the factor
    // exp(dX / s) with dX ~ X / N, so each rectangle errs by at most dX / s relative; weighted by
    // L over the volumes above X, that averages to (X + s) / (s N), the tolerance.
    for (const i of [2000, 8000, 20_000, 30_000]) {
      const x = X[i - 1];
      const exact = s * (Math.exp(-x / s) - Math.exp(-1 / s));
      expect(Math.abs(Math.exp(trace.accumulatedLnZ[i - 1]) / exact - 1)).toBeLessThan((x + s) / (s * N));
    }
  });
});
