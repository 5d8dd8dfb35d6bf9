import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';
import { generalizedParetoShape, paretoShapeLimit, paretoTailShape } from '../../../src/numeric/statistics/paretoTailShape.js';

// Samples of generalised Pareto exceedances and SciPy's maximum-likelihood shape for each
// (fixtures/make_pareto_shapes.py, scipy.stats.genpareto.fit).
const fixture = JSON.parse(readFileSync(new URL('./fixtures/pareto_shapes.json', import.meta.url), 'utf8')) as {
  cases: { trueShape: number; scipyShape: number; sample: number[] }[];
};

describe('generalised Pareto shape (Zhang & Stephens 2009)', () => {
  for (const c of fixture.cases) {
    it(`agrees with SciPy's maximum-likelihood fit on the same 1000 exceedances (shape ${c.trueShape})`, () => {
      // Both estimators are efficient: on one sample they differ far less than either's sampling
      // spread (1 + k)/sqrt(n) = 0.03-0.05; the prior's 10 pseudo-observations at 0.5 move the
      // estimate by at most 0.005. 0.02 allows for both.
      expect(Math.abs(generalizedParetoShape(Float64Array.from(c.sample)) - c.scipyShape)).toBeLessThan(0.02);
    });
  }
});

describe('Pareto k-hat of importance weights (Vehtari et al. 2024)', () => {
  it('is 1 - s^2 for a standard normal target drawn from a normal of variance s^2 < 1', () => {
    // w = p/q = c exp(a x^2 / 2), a = 1/s^2 - 1, x ~ N(0, s^2): P(w > t) ~ P(|x| > r) with
    // r^2 = 2 ln(t/c) / a, which falls as (t/c)^(-1/(a s^2)) up to a slowly varying factor, so the
    // tail index is 1 / (1 - s^2) and k = 1 - s^2 (derived here). s^2 = 0.5: k = 0.5. With 20,000
    // draws the fit uses the 425 largest, whose spread (1 + k)/sqrt(425) is 0.07; the slowly
    // varying factor biases small samples low by a few hundredths. 0.15 is twice the spread.
    const stream = SeededStream.fromSeed(31);
    const s2 = 0.5;
    const count = 20000;
    const lnWeights = new Float64Array(count);
    for (let i = 0; i < count; i++) {
      const x = Math.sqrt(s2) * stream.normal();
      lnWeights[i] = -0.5 * x * x + (0.5 * x * x) / s2 + 0.5 * Math.log(s2);
    }
    expect(Math.abs(paretoTailShape(lnWeights) - 0.5)).toBeLessThan(0.15);
  });

  it('is below zero for weights bounded above (a wider proposal than the target)', () => {
    // s^2 = 2 > 1: w = c exp(-a' x^2 / 2) is bounded, so the tail has a finite end, k < 0.
    const stream = SeededStream.fromSeed(32);
    const lnWeights = new Float64Array(5000);
    for (let i = 0; i < lnWeights.length; i++) {
      const x = Math.sqrt(2) * stream.normal();
      lnWeights[i] = -0.5 * x * x + 0.25 * x * x;
    }
    expect(paretoTailShape(lnWeights)).toBeLessThan(0);
  });

  it('is NaN with too few positive weights, and its limit is min(1 - 1/log10 S, 0.7)', () => {
    expect(Number.isNaN(paretoTailShape([0, -Infinity, -Infinity, -Infinity, -Infinity, -Infinity, -Infinity]))).toBe(true);
    expect(paretoShapeLimit(100)).toBeCloseTo(0.5, 12);
    expect(paretoShapeLimit(1000)).toBeCloseTo(2 / 3, 12);
    expect(paretoShapeLimit(1e6)).toBe(0.7);
  });
});
