import { describe, expect, it } from 'vitest';
import { simulatedLnZSpread } from '../../../src/sampling/nested/evidenceError.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';
import { lnInitialVolume, lnVolumeSlice, removeFromCluster } from '../../../src/sampling/nested/shrinkage.js';

/** Trigamma psi_1(x) for x >= 6 by its asymptotic series (Abramowitz & Stegun 1972, 6.4.12). */
function trigamma(x: number): number {
  return 1 / x + 1 / (2 * x * x) + 1 / (6 * x ** 3) - 1 / (30 * x ** 5) + 1 / (42 * x ** 7);
}

describe('ln X of points removed together', () => {
  it('equals the mean log of the largest order statistics of n uniforms (Monte Carlo)', () => {
    // Removing the k lowest-likelihood of n live points takes the k largest of n uniform prior
    // volumes. E[ln U_(n - j)] = -sum_{l=0}^{j} 1/(n - l) exactly; check by simulation.
    const n = 20;
    const k = 6;
    const expected = new Float64Array(k);
    const clusterLnX = Float64Array.of(0);
    const live = Int32Array.of(n);
    for (let j = 0; j < k; j++) {
      removeFromCluster(clusterLnX, live, 0);
      expected[j] = clusterLnX[0];
    }
    const stream = SeededStream.fromSeed(12);
    const trials = 40000;
    const sum = new Float64Array(k);
    const sumSquares = new Float64Array(k);
    const draws = new Float64Array(n);
    for (let t = 0; t < trials; t++) {
      for (let i = 0; i < n; i++) draws[i] = 1 - stream.uniform();
      draws.sort();
      for (let j = 0; j < k; j++) {
        const value = Math.log(draws[n - 1 - j]);
        sum[j] += value;
        sumSquares[j] += value * value;
      }
    }
    for (let j = 0; j < k; j++) {
      const mean = sum[j] / trials;
      const standardError = Math.sqrt((sumSquares[j] / trials - mean * mean) / trials);
      // 4 standard errors of the Monte-Carlo mean.
      expect(Math.abs(mean - expected[j])).toBeLessThan(4 * standardError);
    }
    // and the flat 1/n per point, wrong for batches, is excluded by the same simulation.
    expect(Math.abs(sum[k - 1] / trials - -k / n)).toBeGreaterThan(0.01);
  });

  it('rectangle-rule slice and initial finite volume by their closed forms', () => {
    expect(lnVolumeSlice(-2, 50)).toBeCloseTo(-2 + Math.log(1 - Math.exp(-1 / 50)), 14);
    expect(lnInitialVolume(100, 100)).toBe(0);
    expect(lnInitialVolume(100, 199)).toBeCloseTo(Math.log(99 / 198), 14);
  });
});

describe('simulated shrinkage spread of ln Z (Higson et al. 2018)', () => {
  it('matches the closed-form spread when one dead point carries all the evidence', () => {
    // With all evidence in dead point m, ln Z = ln L_m + sum_{i<m} ln t_i + ln(1 - t_m), t ~ Beta(n, 1),
    // independent terms: Var ln t = 1/n^2, Var ln(1 - t) = psi_1(1) - psi_1(n + 1) (variance of
    // the log of a Beta(1, n) variate). Here n = 100, m = 1000: sd = 1.3172.
    const n = 100;
    const m = 1000;
    const deadLnL = new Float64Array(m + 1);
    deadLnL[m] = 1000;
    const expected = Math.sqrt(m / n ** 2 + Math.PI ** 2 / 6 - trigamma(n + 1));
    const spread = simulatedLnZSpread(
      {
        deadLnL,
        deadLiveCount: new Float64Array(m + 1).fill(n),
        deadCount: m + 1,
        finalLiveLnL: new Float64Array(n),
        initialFinite: n,
        initialDrawn: n,
      },
      4000,
      7,
    );
    // 4000 simulations: the sample sd of this skewed (log-exponential) variable has a relative
    // standard error of about 1.5%; allow 4 of them.
    expect(Math.abs(spread / expected - 1)).toBeLessThan(0.06);
  });

  it('is zero for a constant likelihood, whose evidence X_0 = 1 does not depend on the t_i', () => {
    const spread = simulatedLnZSpread(
      {
        deadLnL: new Float64Array(500),
        deadLiveCount: new Float64Array(500).fill(50),
        deadCount: 500,
        finalLiveLnL: new Float64Array(50),
        initialFinite: 50,
        initialDrawn: 50,
      },
      200,
      3,
    );
    expect(spread).toBeLessThan(1e-12);
  });
});
