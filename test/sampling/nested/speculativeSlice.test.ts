import { describe, expect, it } from 'vitest';
import { kolmogorovSmirnovPValue, kolmogorovSmirnovUniform } from '../../../src/numeric/statistics/kolmogorovSmirnov.js';
import type { NestedProblem } from '../../../src/sampling/nested/nestedProblem.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';
import { sliceChains } from '../../../src/sampling/nested/sliceChains.js';

// Slice sampling leaves the uniform law on the slice invariant (Neal 2003, Section 4), so chains
// started from exact uniform draws on the slice end uniform after any number of moves; a kernel
// that took speculative candidates in the wrong order, or kept one that lies outside the shrunk
// bracket, would not. Each check is a one-sample Kolmogorov-Smirnov test against a closed-form
// law; with fixed seeds the outcome is deterministic, and the threshold p > 0.001 is what a
// correct sampler fails one time in a thousand seeds.

interface Chains {
  start: Float64Array;
  end: Float64Array;
  evaluations: number;
  rounds: number;
}

async function runChains(
  dim: number, chains: number, inside: (u: Float64Array) => boolean, draw: (stream: SeededStream, out: Float64Array) => void,
  widthScale: number, steps: number, pointsPerChain: number, seed: number,
): Promise<Chains> {
  const stream = SeededStream.fromSeed(seed);
  const start = new Float64Array(chains * dim);
  const row = new Float64Array(dim);
  for (let c = 0; c < chains; c++) {
    draw(stream, row);
    start.set(row, c * dim);
  }
  const whitening = new Float64Array(dim * dim);
  for (let i = 0; i < dim; i++) whitening[i * dim + i] = 1;
  const end = new Float64Array(chains * dim);
  let rounds = 0;
  const evaluations = await sliceChains({
    chains,
    start: { unit: start, physical: start.slice(), lnL: new Float64Array(chains).fill(1) },
    threshold: 0,
    whitening,
    settings: { dim, physicalDim: dim, steps, periodic: null, widthScale, maxExpansions: 100, pointsPerChain },
    seeds: stream,
    evaluate: async (unit, count, physicalOut) => {
      rounds++;
      const lnL = new Float64Array(count);
      for (let n = 0; n < count; n++) {
        const u = unit.subarray(n * dim, n * dim + dim);
        physicalOut.set(u, n * dim);
        lnL[n] = inside(u) ? 1 : -Infinity;
      }
      return lnL;
    },
    out: { unit: end, physical: new Float64Array(chains * dim), lnL: new Float64Array(chains) },
  });
  return { start, end, evaluations, rounds };
}

function pValue(values: Float64Array): number {
  return kolmogorovSmirnovPValue(kolmogorovSmirnovUniform(values), values.length);
}

describe('speculative slice sampling (several points per chain and round)', () => {
  it('keeps the uniform law on an interval: a narrow bracket steps out many times on both sides', async () => {
    // Slice [0.2, 0.9] of the unit interval; bracket width 0.02, so a move steps out about 35
    // times on each side and s = 4 lists several expansions per side in one round. Uniform on the
    // slice: (u - 0.2) / 0.7 ~ U(0, 1) (closed form).
    const inside = (u: Float64Array) => u[0] > 0.2 && u[0] < 0.9;
    const draw = (stream: SeededStream, out: Float64Array) => {
      out[0] = 0.2 + 0.7 * stream.uniform();
    };
    const chains = 3000;
    const slow = await runChains(1, chains, inside, draw, 0.02, 2, 1, 5);
    const fast = await runChains(1, chains, inside, draw, 0.02, 2, 4, 5);
    for (const run of [slow, fast]) {
      const scaled = run.end.map((u) => (u - 0.2) / 0.7);
      expect(pValue(scaled)).toBeGreaterThan(0.001);
      // The chains moved: start and end are nearly uncorrelated (a lazy kernel keeps corr = 1).
      let sxy = 0;
      let sxx = 0;
      for (let c = 0; c < chains; c++) {
        sxy += (run.start[c] - 0.55) * (run.end[c] - 0.55);
        sxx += (run.start[c] - 0.55) ** 2;
      }
      expect(Math.abs(sxy / sxx)).toBeLessThan(0.1);
    }
    // Four points per chain and round: far fewer rounds for more evaluations.
    expect(fast.rounds).toBeLessThan(slow.rounds / 2.5);
    expect(fast.evaluations).toBeGreaterThan(slow.evaluations);
  });

  it('keeps the uniform law on a disc: r^2 / R^2 and the polar angle are uniform', async () => {
    // Disc of radius 0.3 about (0.45, 0.5) with a bracket of width 0.5 that usually needs no
    // stepping out, so most of the work is shrinkage with s = 3 candidates at once; candidates
    // off the cube (x < 0) exercise the unevaluated rejections. For a uniform disc, r^2 / R^2 and
    // (theta + pi) / (2 pi) are U(0, 1) and independent (area element r dr dtheta, closed form).
    const radius = 0.3;
    const cx = 0.45;
    const cy = 0.5;
    const inside = (u: Float64Array) => (u[0] - cx) ** 2 + (u[1] - cy) ** 2 < radius * radius;
    const draw = (stream: SeededStream, out: Float64Array) => {
      const r = radius * Math.sqrt(stream.uniform());
      const theta = 2 * Math.PI * stream.uniform();
      out[0] = cx + r * Math.cos(theta);
      out[1] = cy + r * Math.sin(theta);
    };
    const chains = 3000;
    const run = await runChains(2, chains, inside, draw, 1.2, 3, 3, 11);
    const radial = new Float64Array(chains);
    const angular = new Float64Array(chains);
    for (let c = 0; c < chains; c++) {
      const dx = run.end[2 * c] - cx;
      const dy = run.end[2 * c + 1] - cy;
      radial[c] = (dx * dx + dy * dy) / (radius * radius);
      angular[c] = (Math.atan2(dy, dx) + Math.PI) / (2 * Math.PI);
    }
    expect(pValue(radial)).toBeGreaterThan(0.001);
    expect(pValue(angular)).toBeGreaterThan(0.001);
  });

  it('gives ln Z of a 4-D Gaussian in a wide box within 3 errors of -4 ln 20', async () => {
    // A normalised spherical Gaussian (sigma 1) in the prior box [-10, 10]^4: the truncated mass
    // is below 1e-22, so ln Z = -4 ln 20 (normal distribution, closed form).
    const dim = 4;
    const problem: NestedProblem = {
      dim,
      physicalDim: dim,
      transform(unit, out) {
        for (let i = 0; i < dim; i++) out[i] = 20 * unit[i] - 10;
      },
      logLikelihood(points, count) {
        const lnL = new Float64Array(count);
        for (let n = 0; n < count; n++) {
          let sum = 0;
          for (let i = 0; i < dim; i++) sum += points[n * dim + i] ** 2;
          lnL[n] = -0.5 * sum - 0.5 * dim * Math.log(2 * Math.PI);
        }
        return lnL;
      },
    };
    const result = await runNested(problem, {
      livePoints: 150, seed: 4, method: 'slice', replacementsPerStep: 2, slice: { steps: 8, pointsPerChain: 3 }, evidence: 'nested',
    });
    expect(Math.abs(result.lnZ + 4 * Math.log(20))).toBeLessThan(3 * result.lnZError);
    expect(result.insertionRank.pValue).toBeGreaterThan(0.001);
  });
});
