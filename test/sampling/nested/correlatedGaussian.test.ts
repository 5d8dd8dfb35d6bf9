import { describe, expect, it } from 'vitest';
import type { NestedProblem } from '../../../src/sampling/nested/nestedProblem.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';

// A correlated 3-D Gaussian likelihood, normalised to unit integral over R^3, in the uniform prior
// box [-10, 10]^3. Its nearest box face is 8.2 standard deviations from the mean, so the truncated
// mass is below 1e-15 and ln Z = -ln(box volume) = -3 ln 20 (normal distribution, closed form).
const mean = [1, -2, 0.5];
const covariance = [
  [1.0, 0.8, 0.3],
  [0.8, 1.5, -0.4],
  [0.3, -0.4, 0.7],
];
const boxHalfWidth = 10;
const trueLnZ = -3 * Math.log(2 * boxHalfWidth);

/** Inverse and ln determinant of a symmetric 3x3 matrix by cofactors (Cramer's rule). */
function inverse3(m: number[][]): { inverse: number[][]; lnDeterminant: number } {
  const cofactor = (r: number, c: number) => {
    const rows = [0, 1, 2].filter((i) => i !== r);
    const cols = [0, 1, 2].filter((j) => j !== c);
    const minor = m[rows[0]][cols[0]] * m[rows[1]][cols[1]] - m[rows[0]][cols[1]] * m[rows[1]][cols[0]];
    return (r + c) % 2 === 0 ? minor : -minor;
  };
  const determinant = m[0][0] * cofactor(0, 0) + m[0][1] * cofactor(0, 1) + m[0][2] * cofactor(0, 2);
  const inverse = [0, 1, 2].map((i) => [0, 1, 2].map((j) => cofactor(j, i) / determinant));
  return { inverse, lnDeterminant: Math.log(determinant) };
}

function correlatedGaussianProblem(): NestedProblem {
  const { inverse, lnDeterminant } = inverse3(covariance);
  const lnNormalisation = -1.5 * Math.log(2 * Math.PI) - 0.5 * lnDeterminant;
  return {
    dim: 3,
    physicalDim: 3,
    transform(unit, out) {
      for (let i = 0; i < 3; i++) out[i] = (2 * unit[i] - 1) * boxHalfWidth;
    },
    logLikelihood(points, count) {
      const lnL = new Float64Array(count);
      for (let n = 0; n < count; n++) {
        let quadratic = 0;
        for (let i = 0; i < 3; i++) {
          for (let j = 0; j < 3; j++) quadratic += (points[3 * n + i] - mean[i]) * inverse[i][j] * (points[3 * n + j] - mean[j]);
        }
        lnL[n] = lnNormalisation - 0.5 * quadratic;
      }
      return lnL;
    },
  };
}

describe('correlated Gaussian in a wide uniform box', () => {
  for (const method of ['ellipsoids', 'slice'] as const) {
    it(`${method}: ln Z = -3 ln 20 within 3 errors; posterior mean and covariance within Monte-Carlo error`, async () => {
      const result = await runNested(correlatedGaussianProblem(), { livePoints: 300, seed: 3, method, evidence: 'nested' });
      expect(result.method).toBe(method);
      expect(Math.abs(result.lnZ - trueLnZ)).toBeLessThan(3 * result.lnZError);
      const samples = result.equalWeight();
      const n = samples.length / 3;
      expect(n).toBeGreaterThan(500);
      const sampleMean = [0, 0, 0];
      for (let s = 0; s < n; s++) for (let i = 0; i < 3; i++) sampleMean[i] += samples[3 * s + i] / n;
      const sampleCovariance = [0, 1, 2].map(() => [0, 0, 0]);
      for (let s = 0; s < n; s++) {
        for (let i = 0; i < 3; i++) {
          for (let j = 0; j < 3; j++) sampleCovariance[i][j] += ((samples[3 * s + i] - sampleMean[i]) * (samples[3 * s + j] - sampleMean[j])) / (n - 1);
        }
      }
      // Standard errors for n independent draws: sqrt(S_ii / n) for a mean and
      // sqrt((S_ii S_jj + S_ij^2) / n) for a covariance element (normal theory, Anderson 2003, 3.4).
      // The equal-weight draws come from a weighted sample whose effective size exceeds n, and the
      // shrinkage noise of the weights is a few per cent, so 4 standard errors bounds a correct
      // sampler with room (about 6e-5 per check for a normal deviate).
      for (let i = 0; i < 3; i++) {
        expect(Math.abs(sampleMean[i] - mean[i])).toBeLessThan(4 * Math.sqrt(covariance[i][i] / n));
        for (let j = 0; j < 3; j++) {
          const standardError = Math.sqrt((covariance[i][i] * covariance[j][j] + covariance[i][j] ** 2) / n);
          expect(Math.abs(sampleCovariance[i][j] - covariance[i][j])).toBeLessThan(4 * standardError);
        }
      }
    });
  }
});
