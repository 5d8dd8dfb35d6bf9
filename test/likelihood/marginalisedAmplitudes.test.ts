import { describe, expect, it } from 'vitest';
import { MarginalisedAmplitudes } from '../../src/likelihood/marginalisedAmplitudes.js';
import { CholeskyDecomposition, Matrix } from 'ml-matrix';

// Deterministic pseudo-random numbers for test data (a linear congruential generator,
// Numerical Recipes' constants); the values only need to be reproducible.
function lcg(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 4294967296;
  };
}

function logSumExp(values: number[]): number {
  const top = Math.max(...values);
  return top + Math.log(values.reduce((s, v) => s + Math.exp(v - top), 0));
}

describe('marginalised-amplitude likelihood', () => {
  it('equals brute-force numerical integration over one amplitude', () => {
    // Reference: direct quadrature of integral N(d | a B, C) N(a | 0, s^2) da on a fine grid
    // (composite trapezoid over +-12 posterior widths; its error here is far below 1e-9).
    const random = lcg(7);
    const n = 60;
    const basis = new Float64Array(n);
    const sigma = new Float64Array(n);
    const data = new Float64Array(n);
    const trueAmplitude = 2.5;
    for (let i = 0; i < n; i++) {
      basis[i] = Math.exp(-((i - 30) ** 2) / 50);
      sigma[i] = 0.1 + 0.2 * random();
      data[i] = trueAmplitude * basis[i] + sigma[i] * (random() - 0.5) * 2;
    }
    const priorSigma = 10;
    const likelihood = new MarginalisedAmplitudes(data, sigma, 1, priorSigma);
    const analytic = likelihood.logLikelihood(basis);

    const logJoint = (a: number): number => {
      let s = -0.5 * Math.log(2 * Math.PI * priorSigma * priorSigma) - 0.5 * (a / priorSigma) ** 2;
      for (let i = 0; i < n; i++) {
        const r = (data[i] - a * basis[i]) / sigma[i];
        s += -0.5 * Math.log(2 * Math.PI * sigma[i] * sigma[i]) - 0.5 * r * r;
      }
      return s;
    };
    const centre = likelihood.amplitudes[0];
    let precision = 1 / priorSigma ** 2;
    for (let i = 0; i < n; i++) precision += (basis[i] / sigma[i]) ** 2;
    const width = 1 / Math.sqrt(precision);
    const steps = 20000;
    const h = (24 * width) / steps;
    const values: number[] = [];
    for (let j = 0; j <= steps; j++) {
      const weight = j === 0 || j === steps ? 0.5 : 1;
      values.push(logJoint(centre - 12 * width + j * h) + Math.log(weight * h));
    }
    expect(analytic).toBeCloseTo(logSumExp(values), 8);
  });

  it('equals the closed-form Gaussian evidence for three amplitudes', () => {
    // Reference: d ~ Normal(0, C + s^2 B B^T) marginally (Bishop 2006, eq. 2.115), evaluated
    // with ml-matrix's Cholesky decomposition of that N x N covariance (a general-purpose library).
    const random = lcg(11);
    const n = 12;
    const k = 3;
    const basis = new Float64Array(k * n);
    const sigma = new Float64Array(n);
    const data = new Float64Array(n);
    for (let i = 0; i < k * n; i++) basis[i] = random() - 0.3;
    for (let i = 0; i < n; i++) { sigma[i] = 0.5 + random(); data[i] = 3 * (random() - 0.5); }
    const s = 1.7;
    const analytic = new MarginalisedAmplitudes(data, sigma, k, s).logLikelihood(basis);
    const cov = new Matrix(n, n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        let v = i === j ? sigma[i] ** 2 : 0;
        for (let p = 0; p < k; p++) v += s * s * basis[p * n + i] * basis[p * n + j];
        cov.set(i, j, v);
        cov.set(j, i, v);
      }
    }
    const factor = new CholeskyDecomposition(cov);
    const lower = factor.lowerTriangularMatrix;
    let logDet = 0;
    for (let i = 0; i < n; i++) logDet += 2 * Math.log(lower.get(i, i));
    const solved = factor.solve(Matrix.columnVector(Array.from(data)));
    let quadratic = 0;
    for (let i = 0; i < n; i++) quadratic += data[i] * solved.get(i, 0);
    const reference = -0.5 * (n * Math.log(2 * Math.PI) + logDet + quadratic);
    expect(analytic).toBeCloseTo(reference, 9);
  });
});
