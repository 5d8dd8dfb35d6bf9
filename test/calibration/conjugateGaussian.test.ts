import { describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SeededStream } from '../../src/numeric/random/seededStream.js';
import { weightsFromLogWeights } from '../../src/numeric/statistics/weightsFromLogWeights.js';
import { parameterSummary } from '../../src/results/parameterSummary.js';
import { writePosteriorTables } from '../../src/records/posteriorTables.js';
import { calibrationStatistics, readDrawPosterior, type DrawPosterior } from '../../src/calibration/collectCalibration.js';
import type { CalibrationDraw } from '../../src/calibration/calibrationDraws.js';

// Simulation-based calibration (Talts et al. 2018) of a problem whose posterior is known exactly:
// two means with normal priors, a ~ N(0, 1) and b ~ N(2, 0.5^2), each seen through n = 4
// observations of unit noise. The posterior is normal with precision 1/tau^2 + n/sigma^2 and
// mean (mu0/tau^2 + sum y / sigma^2) / precision (conjugate normal model; Gelman et al. 2013,
// Bayesian Data Analysis, 3rd ed., eq. 2.12). Posteriors drawn exactly must give uniform ranks
// and nominal coverage; a sampler whose posterior is half as wide, or shifted by one posterior
// standard deviation, must be caught. The statistics are computed by the calibration's own
// code (calibrationStatistics), from weighted samples and reported intervals as a run writes them.

const PRIORS = [{ name: 'a', mean: 0, sigma: 1 }, { name: 'b', mean: 2, sigma: 0.5 }];
const OBSERVATIONS = 4;
const DRAWS = 400;
const SAMPLES = 2000;
const L = 99;

type Sampler = 'exact' | 'importance' | 'narrow' | 'shifted';

/** One simulated draw and its posterior sample by the given (good or bad) sampler. */
function simulate(k: number, sampler: Sampler, stream: SeededStream): DrawPosterior {
  const truth: Record<string, number> = {};
  const points = new Float64Array(SAMPLES * PRIORS.length);
  const lnWeight = new Float64Array(SAMPLES);
  PRIORS.forEach((prior, c) => {
    const theta = prior.mean + prior.sigma * stream.normal();
    truth[prior.name] = theta;
    let sum = 0;
    for (let i = 0; i < OBSERVATIONS; i++) sum += theta + stream.normal();
    const precision = 1 / prior.sigma ** 2 + OBSERVATIONS;
    const mean = (prior.mean / prior.sigma ** 2 + sum) / precision;
    const sd = 1 / Math.sqrt(precision);
    for (let s = 0; s < SAMPLES; s++) {
      if (sampler === 'importance') {
        // Prior draws weighted by the likelihood, as nested sampling's weighted samples are.
        const x = prior.mean + prior.sigma * stream.normal();
        points[s * PRIORS.length + c] = x;
        lnWeight[s] += -0.5 * OBSERVATIONS * (x - sum / OBSERVATIONS) ** 2;
      } else {
        const width = sampler === 'narrow' ? 0.5 * sd : sd;
        const centre = sampler === 'shifted' ? mean + sd : mean;
        points[s * PRIORS.length + c] = centre + width * stream.normal();
      }
    }
  });
  const weights = weightsFromLogWeights(lnWeight);
  const intervals = new Map(PRIORS.map((p, c) => {
    const column = Float64Array.from({ length: SAMPLES }, (_, s) => points[s * PRIORS.length + c]);
    const summary = parameterSummary(column, weights);
    return [p.name, { unit: '', interval68: [summary.interval68.lower, summary.interval68.upper] as const, interval95: [summary.interval95.lower, summary.interval95.upper] as const }];
  }));
  const draw: CalibrationDraw = { id: `draw-${k}`, withPerturber: false, noiseSeed: 1000 + k, truth };
  return { draw, posterior: { names: PRIORS.map((p) => p.name), dim: PRIORS.length, count: SAMPLES, points, weights }, intervals, lnBayesFactor: null, stopReason: 'converged' };
}

function calibrate(sampler: Sampler, seed: number): ReturnType<typeof calibrationStatistics> {
  const stream = SeededStream.fromSeed(seed);
  return calibrationStatistics(Array.from({ length: DRAWS }, (_, k) => simulate(k, sampler, stream)), L, 7);
}

// Binomial standard error of a coverage fraction over DRAWS draws at nominal level q.
const se = (q: number): number => Math.sqrt((q * (1 - q)) / DRAWS);

describe('simulation-based calibration of a conjugate normal model', () => {
  // p > 0.001: a calibrated sampler fails one of the four tests (2 parameters x chi-square, KS)
  // with probability below 0.4% at a given seed; coverage within 3.5 standard errors of nominal.
  for (const sampler of ['exact', 'importance'] as const) {
    it(`finds uniform ranks and nominal coverage for ${sampler} posterior samples`, () => {
      const { parameters } = calibrate(sampler, 11);
      expect(parameters.map((p) => p.name)).toEqual(['a', 'b']);
      for (const p of parameters) {
        expect(p.draws).toBe(DRAWS);
        expect(p.rankHistogram).toHaveLength(20);
        expect(p.chiSquarePValue, `${p.name} chi-square`).toBeGreaterThan(0.001);
        expect(p.ksPValue, `${p.name} KS`).toBeGreaterThan(0.001);
        expect(Math.abs(p.coverage68.fraction! - 0.68), `${p.name} 68%`).toBeLessThan(3.5 * se(0.68));
        expect(Math.abs(p.coverage95.fraction! - 0.95), `${p.name} 95%`).toBeLessThan(3.5 * se(0.95));
        for (const c of p.coverageCurve) expect(Math.abs(c.fraction! - c.level), `${p.name} at ${c.level}`).toBeLessThan(3.5 * se(c.level) + 1e-12);
      }
    });
  }

  it('catches a posterior half as wide as the true one', () => {
    for (const p of calibrate('narrow', 12).parameters) {
      // Half-width intervals cover P(|Z| < 0.5) = 0.38 at nominal 68% and P(|Z| < 0.98) = 0.67 at 95%.
      expect(p.chiSquarePValue).toBeLessThan(1e-10);
      expect(p.coverage68.fraction!).toBeLessThan(0.5);
      expect(p.coverage95.fraction!).toBeLessThan(0.8);
      // Too many truths fall in the outermost rank bins (the U shape of an overconfident posterior).
      expect(p.rankHistogram[0] + p.rankHistogram[19]).toBeGreaterThan(4 * (2 * DRAWS) / 20);
    }
  });

  it('catches a posterior shifted by one standard deviation', () => {
    for (const p of calibrate('shifted', 13).parameters) {
      expect(p.ksPValue).toBeLessThan(1e-10);
      expect(p.chiSquarePValue).toBeLessThan(1e-10);
    }
  });

  it('reads the same posteriors back from run folders and gets the same ranks', () => {
    const stream = SeededStream.fromSeed(14);
    const root = mkdtempSync(join(tmpdir(), 'arcsift-sbc-'));
    const draws = Array.from({ length: 30 }, (_, k) => simulate(k, 'importance', stream));
    const read = draws.map((d) => {
      const folder = join(root, d.draw.id);
      mkdirSync(folder);
      const lnWeight = Float64Array.from(d.posterior.weights, Math.log);
      writePosteriorTables(folder, {
        sampler: 'nested', names: ['a', 'b'], units: ['', ''], lnEvidence: 0, lnEvidenceError: 0,
        weighted: { points: d.posterior.points, lnWeight, lnLikelihood: new Float64Array(SAMPLES) },
      });
      const parameters = ['a', 'b'].map((name) => ({ name, unit: '', median: 0, interval68: d.intervals.get(name)!.interval68, interval95: d.intervals.get(name)!.interval95 }));
      writeFileSync(join(folder, 'summary.json'), JSON.stringify({ kind: 'fit', sampler: 'nested', model: { stopReason: 'converged', parameters } }));
      return readDrawPosterior(folder, d.draw);
    });
    // Ranks and interval flags exactly; the posterior CDF to 1e-12, since the weights pass through
    // their logarithms and back (a few units in the last place).
    const fromFiles = calibrationStatistics(read, L, 7).rows;
    const inMemory = calibrationStatistics(draws, L, 7).rows;
    expect(fromFiles.map(({ cdf: _cdf, ...rest }) => rest)).toEqual(inMemory.map(({ cdf: _cdf, ...rest }) => rest));
    fromFiles.forEach((r, k) => expect(r.cdf).toBeCloseTo(inMemory[k].cdf, 12));
  });
});
