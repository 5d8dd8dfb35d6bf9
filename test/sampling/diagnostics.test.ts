import { describe, expect, it } from 'vitest';
import {
  AutocovariancePlan, bulkEffectiveSampleSize, chainEffectiveSampleSize, ensembleAutocorrelationTimes,
  integratedAutocorrelationTime, splitRHat, tailEffectiveSampleSize, type Draws,
} from '../../src/sampling/diagnostics/index.js';
import { SeededStream } from '../../src/numeric/random/seededStream.js';

// Independent AR(1) series x_t = phi x_{t-1} + e_t, e_t ~ N(0, 1), started in equilibrium,
// stored as an ensemble chain (steps x walkers x 1).
function ar1Ensemble(phi: number, steps: number, walkers: number, seed: number): Float64Array {
  const random = SeededStream.fromSeed(seed);
  const chain = new Float64Array(steps * walkers);
  for (let w = 0; w < walkers; w++) {
    let x = random.normal() / Math.sqrt(1 - phi * phi);
    for (let s = 0; s < steps; s++) {
      x = phi * x + random.normal();
      chain[s * walkers + w] = x;
    }
  }
  return chain;
}

function normalDraws(chains: number, drawsPerChain: number, seed: number, shift = (_chain: number) => 0, scale = (_chain: number) => 1): Draws {
  const random = SeededStream.fromSeed(seed);
  const values = new Float64Array(chains * drawsPerChain);
  for (let j = 0; j < chains; j++) {
    for (let i = 0; i < drawsPerChain; i++) values[j * drawsPerChain + i] = shift(j) + scale(j) * random.normal();
  }
  return { values, chains, drawsPerChain };
}

describe('autocovariance by FFT', () => {
  it('equals the direct sum (1/n) sum (x_i - mean)(x_{i+t} - mean)', () => {
    const random = SeededStream.fromSeed(7);
    const n = 37;
    const x = Float64Array.from({ length: n }, () => random.normal());
    const mean = x.reduce((a, b) => a + b, 0) / n;
    const fast = new Float64Array(n);
    new AutocovariancePlan(n).compute(x, 0, 1, fast);
    for (let t = 0; t < n; t++) {
      let direct = 0;
      for (let i = 0; i + t < n; i++) direct += (x[i] - mean) * (x[i + t] - mean);
      expect(fast[t]).toBeCloseTo(direct / n, 12);
    }
  });
});

describe('integrated autocorrelation time (Sokal windowing)', () => {
  it('recovers tau = (1 + phi) / (1 - phi) = 19 for AR(1) with phi = 0.9', () => {
    // Closed form: rho(t) = phi^|t|, so tau = sum_t phi^|t| = (1 + phi) / (1 - phi) (Sokal 1997).
    // Statistical error (Madras & Sokal 1988, as quoted in Sokal 1997; not checked, neither was
    // reachable here):
    // var(tau) / tau^2 ~ 2 (2M + 1) / N with
    // M ~ 5 tau ~ 95 and N = 64 x 40000 draws: 1.2 %. The window cut and the per-walker mean
    // bias tau low by < 1 %. 5 % is about 4 sigma.
    const phi = 0.9;
    const steps = 40000;
    const walkers = 64;
    const { tau, reliable } = ensembleAutocorrelationTimes(ar1Ensemble(phi, steps, walkers, 11), { steps, walkers, dim: 1 });
    expect(reliable).toBe(true);
    expect(Math.abs(tau[0] / ((1 + phi) / (1 - phi)) - 1)).toBeLessThan(0.05);
  });

  it('picks the smallest window M >= c tau(M) on a known autocorrelation', () => {
    // rho(t) = 0.5^t: tau(M) = 1 + 2 (1 - 0.5^M) -> 3; with c = 5 the first M >= 5 tau(M) is M = 15.
    const rho = Float64Array.from({ length: 100 }, (_, t) => 0.5 ** t);
    const estimate = integratedAutocorrelationTime(rho, 5);
    expect(estimate.window).toBe(15);
    expect(estimate.tau).toBeCloseTo(3 - 2 * 0.5 ** 15, 12);
    // Too short a series: no window satisfies the rule.
    expect(integratedAutocorrelationTime(rho, 5, 10).reliable).toBe(false);
  });
});

describe('rank-normalised split R-hat (Vehtari et al. 2021)', () => {
  it('is near 1 for well-mixed chains', () => {
    // Vehtari et al. 2021 recommend trusting chains with R-hat < 1.01; independent draws sit
    // at 1 + O(1/n), here ~1e-3.
    expect(splitRHat(normalDraws(4, 1000, 3))).toBeLessThan(1.01);
  });

  it('is clearly above 1.05 for chains stuck at different means', () => {
    expect(splitRHat(normalDraws(4, 1000, 4, (j) => (j === 3 ? 1 : 0)))).toBeGreaterThan(1.05);
  });

  it('catches chains with equal means but different scales (the folded part)', () => {
    // Same centre, one chain three times as wide: only |theta - median| tells them apart.
    expect(splitRHat(normalDraws(4, 1000, 5, () => 0, (j) => (j === 0 ? 3 : 1)))).toBeGreaterThan(1.05);
  });

  it('catches a trend within each chain (the split)', () => {
    const draws = normalDraws(4, 1000, 6);
    for (let j = 0; j < 4; j++) for (let i = 0; i < 1000; i++) draws.values[j * 1000 + i] += (i < 500 ? 0 : 1);
    expect(splitRHat(draws)).toBeGreaterThan(1.05);
  });
});

describe('effective sample size (Vehtari et al. 2021, Geyer 1992)', () => {
  // For independent draws ESS is the draw count (Vehtari et al. 2021). We measured the scatter of
  // the estimate at 4.5 % for 4 x 1000 draws over 30 seeds; at 4 x 10000 it scales to ~1.5 %, so a
  // 10 % band is more than 4 sigma.
  const draws = normalDraws(4, 10000, 8);
  const total = 40000;

  it('bulk and tail ESS of independent normal draws are close to the draw count', () => {
    expect(Math.abs(chainEffectiveSampleSize(draws) / total - 1)).toBeLessThan(0.1);
    expect(Math.abs(bulkEffectiveSampleSize(draws) / total - 1)).toBeLessThan(0.1);
    expect(Math.abs(tailEffectiveSampleSize(draws) / total - 1)).toBeLessThan(0.1);
  });

  it('is N (1 - phi) / (1 + phi) for AR(1) chains', () => {
    // ESS = N / tau with the closed-form tau of AR(1), phi = 0.5: tau = 3. Scatter of tau by the
    // same Madras-Sokal estimate, M ~ 15, N = 160000: 2 %; 10 % is 5 sigma.
    const phi = 0.5;
    const steps = 40000;
    const chains = 4;
    const ensemble = ar1Ensemble(phi, steps, chains, 9);
    const values = new Float64Array(chains * steps);
    for (let j = 0; j < chains; j++) for (let i = 0; i < steps; i++) values[j * steps + i] = ensemble[i * chains + j];
    const ess = bulkEffectiveSampleSize({ values, chains, drawsPerChain: steps });
    expect(Math.abs(ess / ((chains * steps) / 3) - 1)).toBeLessThan(0.1);
  });
});
