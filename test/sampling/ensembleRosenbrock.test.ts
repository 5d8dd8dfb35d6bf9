import { describe, expect, it } from 'vitest';
import { runEnsemble } from '../../src/sampling/ensemble/index.js';
import { retainedMeanWithError } from './chainMeanError.js';

// The 2-D Rosenbrock density used by Goodman & Weare 2010 (sec. 6):
//   p(x, y) ∝ exp(-((1 - x)^2 + 100 (y - x^2)^2) / 20).
// It factorises: exp(-(1 - x)^2 / 20) is N(1, 10) in x, and for fixed x, exp(-100 (y - x^2)^2 / 20)
// = exp(-(y - x^2)^2 / (2 * 0.1)) is N(x^2, 0.1) in y with an x-independent normaliser. Hence
//   E[x] = 1,  E[(x - 1)^2] = 10,  E[y] = E[x^2] = var(x) + E[x]^2 = 10 + 1 = 11.
function logRosenbrock(points: Float64Array, count: number): Float64Array {
  const out = new Float64Array(count);
  for (let p = 0; p < count; p++) {
    const x = points[2 * p];
    const y = points[2 * p + 1];
    out[p] = -((1 - x) ** 2 + 100 * (y - x * x) ** 2) / 20;
  }
  return out;
}

describe('ensemble MCMC on the Rosenbrock density', () => {
  it('recovers E[x] = 1, var(x) = 10 and E[y] = 11 within 4 Monte-Carlo sigma', async () => {
    const result = await runEnsemble({ dim: 2, logPosterior: logRosenbrock }, {
      walkers: 100,
      seed: 31,
      start: { ball: { center: Float64Array.of(1, 1), scale: Float64Array.of(0.1, 0.1) } },
      maxSteps: 60000,
      thin: 10,
    });
    // Each check: the function, its exact mean, and the largest Monte-Carlo error at which the check
    // still says something (the autocorrelation time here is ~1000 iterations, so a short or
    // badly mixing run fails on that bound rather than passing on a huge error bar).
    const checks: Array<[(x: number, y: number) => number, number, number]> = [
      [(x) => x, 1, 0.1],
      [(x) => (x - 1) ** 2, 10, 0.6],
      [(_x, y) => y, 11, 0.6],
    ];
    for (const [f, expected, largestError] of checks) {
      const { mean, error } = retainedMeanWithError(result, (chain, at) => f(chain[at], chain[at + 1]));
      expect(error).toBeLessThan(largestError);
      expect(Math.abs(mean - expected)).toBeLessThan(4 * error);
    }
  });
});
