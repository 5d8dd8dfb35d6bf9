import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  decodeFloat64, encodeFloat64, isCheckSweep, mixingCheck, mixingDiagnostics, posteriorOnSpace, runEnsemble, type EnsembleOptions, type EnsembleResult,
} from '../../src/sampling/ensemble/index.js';
import { ParameterSpace } from '../../src/priors/parameterSpace.js';

// Behaviour of the run itself: reproducibility, checkpoints, rejections, starts, options.
const folder = mkdtempSync(join(tmpdir(), 'arcsift-ensemble-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

const DIM = 3;
function logStandardNormal(points: Float64Array, count: number): Float64Array {
  const out = new Float64Array(count);
  for (let p = 0; p < count; p++) {
    let q = 0;
    for (let d = 0; d < DIM; d++) q += points[p * DIM + d] ** 2;
    out[p] = -0.5 * q;
  }
  return out;
}

/** The same density, evaluated asynchronously in reversed chunks of 3 (as a thread pool might). */
async function logStandardNormalScattered(points: Float64Array, count: number): Promise<Float64Array> {
  const out = new Float64Array(count);
  const jobs: Promise<void>[] = [];
  for (let start = count - 3; start > -3; start -= 3) {
    const from = Math.max(0, start);
    const to = start + 3;
    jobs.push(new Promise((resolve) => {
      setImmediate(() => {
        out.set(logStandardNormal(points.slice(from * DIM, to * DIM), to - from), from);
        resolve();
      });
    }));
  }
  await Promise.all(jobs);
  return out;
}

const baseOptions = (extra: Partial<EnsembleOptions> = {}): EnsembleOptions => ({
  walkers: 12,
  seed: 4242,
  start: { around: { center: new Float64Array(DIM), spread: new Float64Array(DIM).fill(0.5) } },
  maxSweeps: 600,
  thin: 2,
  proposal: [{ proposal: 'stretch', weight: 2 }, { proposal: 'differentialEvolution', weight: 1 }],
  stopRule: { minEffectiveSampleSize: 1e9, maxRHat: 1.01 }, // never met: the checks still run
  checkEverySweeps: 40,
  ...extra,
});

function expectIdentical(a: EnsembleResult, b: EnsembleResult): void {
  expect(Buffer.from(a.chain.buffer).equals(Buffer.from(b.chain.buffer))).toBe(true);
  expect(Buffer.from(a.logPosterior.buffer).equals(Buffer.from(b.logPosterior.buffer))).toBe(true);
  expect(Array.from(a.acceptanceFraction)).toEqual(Array.from(b.acceptanceFraction));
  expect(Array.from(a.autocorrelationTime)).toEqual(Array.from(b.autocorrelationTime));
  expect(Array.from(a.rHat)).toEqual(Array.from(b.rHat));
  expect([a.steps, a.sweeps, a.evaluations, a.nonFiniteProposals, a.converged])
    .toEqual([b.steps, b.sweeps, b.evaluations, b.nonFiniteProposals, b.converged]);
}

describe('runEnsemble', () => {
  it('gives the same chain for a seed however the batch is evaluated', async () => {
    const plain = await runEnsemble({ dim: DIM, logPosterior: logStandardNormal }, baseOptions());
    const scattered = await runEnsemble({ dim: DIM, logPosterior: logStandardNormalScattered }, baseOptions());
    expectIdentical(plain, scattered);
    expect(plain.steps).toBe(300);
    expect(plain.chain.length).toBe(300 * 12 * DIM);
    expect(plain.evaluations).toBe(12 + 600 * 12);
    const other = await runEnsemble({ dim: DIM, logPosterior: logStandardNormal }, baseOptions({ seed: 4243 }));
    expect(Buffer.from(other.chain.buffer).equals(Buffer.from(plain.chain.buffer))).toBe(false);
  });

  it('stopped by a signal and resumed from its checkpoint, ends bit-identical to an uninterrupted run', async () => {
    let evaluated = 0;
    const problem = {
      dim: DIM,
      logPosterior: (points: Float64Array, count: number) => {
        evaluated += count;
        return logStandardNormal(points, count);
      },
    };
    const whole = await runEnsemble(problem, baseOptions());
    evaluated = 0;
    const path = join(folder, 'resume.json');
    const checkpoint = { path, everySeconds: 3600 };
    // Two interruptions, at sweeps 230 and 417 (neither a multiple of checkEverySweeps); the
    // checkpoints are then written only when the run stops.
    let resumed: EnsembleResult | null = null;
    for (const stopAt of [230, 417, Infinity]) {
      const signal = { stopRequested: false };
      resumed = await runEnsemble(problem, baseOptions({
        checkpoint, resume: true, signal,
        onProgress: (progress) => {
          if (progress.sweep >= stopAt) signal.stopRequested = true;
        },
      }));
      if (stopAt !== Infinity) {
        expect(resumed.stopped).toBe(true);
        expect(resumed.sweeps).toBe(stopAt);
        expect(JSON.parse(readFileSync(path, 'utf8')).sweep).toBe(stopAt);
      }
    }
    expect(resumed!.stopped).toBe(false);
    expectIdentical(resumed!, whole);
    // The segments continued each other: together they evaluated exactly what one run did.
    expect(evaluated).toBe(whole.evaluations);
    const saved = JSON.parse(readFileSync(path, 'utf8'));
    expect(saved.sweep).toBe(600);
    expect(saved.random.generator).toBe('mt19937');
    expect(saved.chain.encoding).toBe('float64-le-base64');
  });

  it('stops at the first check where every R-hat and ESS meet the stop rule (Vehtari et al. 2021 numbers)', async () => {
    const rule = { minEffectiveSampleSize: 400, maxRHat: 1.01 };
    const options: EnsembleOptions = {
      walkers: 12, seed: 21, maxSweeps: 50000, stopRule: rule, checkEverySweeps: 100,
      start: { around: { center: new Float64Array(DIM), spread: new Float64Array(DIM).fill(1) } },
    };
    const result = await runEnsemble({ dim: DIM, logPosterior: logStandardNormal }, options);
    expect(result.converged).toBe(true);
    expect(result.sweeps).toBeLessThan(50000);
    expect(isCheckSweep(result.sweeps, 100)).toBe(true);
    // The rule as stated, re-checked on the returned diagnostics (the final check's chain).
    for (let k = 0; k < DIM; k++) {
      expect(result.rHat[k]).toBeLessThanOrEqual(1.01);
      expect(result.effectiveSampleSize[k]).toBeGreaterThanOrEqual(400);
      expect(result.tailEffectiveSampleSize[k]).toBeGreaterThanOrEqual(400);
    }
    // The check before (at the last check sweep below, thin 1 so the chain's first rows) did not meet it.
    let steps = result.steps - 100;
    while (!isCheckSweep(steps, 100)) steps -= 100;
    const check = mixingCheck(mixingDiagnostics(result.chain.subarray(0, steps * 12 * DIM), { steps, walkers: 12, dim: DIM }, Math.floor(steps / 2)), rule);
    expect(check.met).toBe(false);
  });

  it('checks every 100 sweeps up to 1000, then at multiples of 100 about 10% apart', () => {
    const checks = Array.from({ length: 3000 }, (_, i) => i + 1).filter((sweep) => isCheckSweep(sweep, 100));
    expect(checks).toEqual([100, 200, 300, 400, 500, 600, 700, 800, 900, 1000, 1100, 1300, 1500, 1700, 1900, 2100, 2400, 2700, 3000]);
  });

  it('writes a checkpoint at the end of the first sweep that ends the given seconds after the last', async () => {
    const path = join(folder, 'seconds.json');
    const written: number[] = [];
    await runEnsemble({ dim: DIM, logPosterior: logStandardNormal }, baseOptions({
      maxSweeps: 30,
      checkpoint: { path, everySeconds: 1e-9 },
      onProgress: (progress) => { written.push(JSON.parse(readFileSync(path, 'utf8')).sweep - progress.sweep); },
    }));
    // A vanishing interval writes after every sweep: the file always holds the sweep just ended.
    expect(written).toEqual(new Array(30).fill(0));
  });

  it('stores the caller\'s run identity and hands it back on resume before reading the state', async () => {
    const path = join(folder, 'identity.json');
    const problem = { dim: DIM, logPosterior: logStandardNormal };
    await runEnsemble(problem, baseOptions({ maxSweeps: 20, checkpoint: { path, everySeconds: 60, identity: { config: 'abc' } } }));
    expect(JSON.parse(readFileSync(path, 'utf8')).runIdentity).toEqual({ config: 'abc' });
    const seen: unknown[] = [];
    const refused = runEnsemble(problem, baseOptions({
      maxSweeps: 40, resume: true,
      checkpoint: {
        path, everySeconds: 60, identity: { config: 'def' },
        checkIdentity: (stored) => {
          seen.push(stored);
          throw new InputError('another config');
        },
      },
    }));
    await expect(refused).rejects.toThrow(/another config/);
    expect(seen).toEqual([{ config: 'abc' }]);
  });

  it('refuses a checkpoint written by a run with other settings', async () => {
    const path = join(folder, 'other.json');
    const problem = { dim: DIM, logPosterior: logStandardNormal };
    await runEnsemble(problem, baseOptions({ maxSweeps: 20, checkpoint: { path, everySeconds: 10 } }));
    await expect(runEnsemble(problem, baseOptions({ walkers: 14, checkpoint: { path, everySeconds: 10 }, resume: true })))
      .rejects.toThrow(/other\.json, key run\.walkers: the checkpoint belongs to another run: expected walkers = 14, found 12/);
    writeFileSync(path, '{ not json');
    await expect(runEnsemble(problem, baseOptions({ checkpoint: { path, everySeconds: 10 }, resume: true })))
      .rejects.toBeInstanceOf(InputError);
  });

  it('counts non-finite log densities as rejections', async () => {
    // Uniform density on the unit cube, -Infinity outside, NaN on a slab: every proposal there is
    // rejected and counted; the walkers never leave the cube.
    let nonFinite = 0;
    let calls = 0;
    const logPosterior = (points: Float64Array, count: number): Float64Array => {
      const out = new Float64Array(count);
      for (let p = 0; p < count; p++) {
        let inside = true;
        for (let d = 0; d < DIM; d++) inside &&= points[p * DIM + d] >= 0 && points[p * DIM + d] <= 1;
        out[p] = !inside ? -Infinity : points[p * DIM] > 0.9 ? Number.NaN : 0;
        if (calls > 0 && !Number.isFinite(out[p])) nonFinite++;
      }
      calls++;
      return out;
    };
    const start = new Float64Array(40 * DIM);
    for (let i = 0; i < start.length; i++) start[i] = ((i * 0.618034) % 1) * 0.85;
    const result = await runEnsemble({ dim: DIM, logPosterior }, {
      walkers: 12, seed: 5, start: { draws: start }, maxSweeps: 200,
    });
    expect(nonFinite).toBeGreaterThan(100);
    expect(result.nonFiniteProposals).toBe(nonFinite);
    for (let i = 0; i < result.chain.length; i++) {
      expect(result.chain[i]).toBeGreaterThanOrEqual(0);
      expect(result.chain[i]).toBeLessThanOrEqual(i % DIM === 0 ? 0.9 : 1);
    }
  });

  it('starts from distinct given draws, and redraws Gaussian walkers whose density is not finite', async () => {
    const points = Float64Array.from({ length: 20 * DIM }, (_, i) => i);
    let first: Float64Array | null = null;
    await runEnsemble({
      dim: DIM,
      logPosterior: (p, count) => {
        first ??= p.slice(0, count * DIM);
        return logStandardNormal(p, count);
      },
    }, { walkers: 12, seed: 9, start: { draws: points }, maxSweeps: 1 });
    const rows = new Set<number>();
    for (let w = 0; w < 12; w++) {
      const row = first![w * DIM] / DIM;
      expect(Number.isInteger(row)).toBe(true);
      expect(Array.from(first!.subarray(w * DIM, (w + 1) * DIM))).toEqual([3 * row, 3 * row + 1, 3 * row + 2]);
      rows.add(row);
    }
    expect(rows.size).toBe(12);

    // Half-space x0 >= 0: a Gaussian at the origin puts about half the walkers outside at first.
    const half = await runEnsemble({
      dim: DIM,
      logPosterior: (p, count) => logStandardNormal(p, count).map((v, i) => (p[i * DIM] >= 0 ? v : -Infinity)),
    }, { walkers: 12, seed: 10, start: { around: { center: new Float64Array(DIM), spread: new Float64Array(DIM).fill(1) } }, maxSweeps: 5 });
    for (let w = 0; w < 12; w++) expect(half.chain[w * DIM]).toBeGreaterThanOrEqual(0);
    expect(half.evaluations).toBeGreaterThan(12 + 5 * 12);

    await expect(runEnsemble({ dim: DIM, logPosterior: logStandardNormal },
      { walkers: 12, seed: 9, start: { draws: points.subarray(0, 11 * DIM) }, maxSweeps: 1 }))
      .rejects.toThrow(/start\.draws: expected at least 12 draws of 3 values/);
    await expect(runEnsemble({ dim: DIM, logPosterior: (_p, count) => new Float64Array(count).fill(-Infinity) },
      { walkers: 12, seed: 9, start: { around: { center: new Float64Array(DIM), spread: new Float64Array(DIM).fill(1) } }, maxSweeps: 1 }))
      .rejects.toThrow(/12 of 12 walkers without one after 100 rounds/);
  });

  it('rejects bad options with InputError', async () => {
    const problem = { dim: DIM, logPosterior: logStandardNormal };
    await expect(runEnsemble(problem, baseOptions({ walkers: 13 }))).rejects.toThrow(/walkers: expected an even number, found 13/);
    await expect(runEnsemble(problem, baseOptions({ walkers: 4 }))).rejects.toThrow(/walkers: expected an integer >= 6, found 4/);
    await expect(runEnsemble(problem, baseOptions({ proposal: 'walk' as never }))).rejects.toThrow(/one of stretch, differentialEvolution/);
    await expect(runEnsemble(problem, baseOptions({ seed: 0 }))).rejects.toBeInstanceOf(InputError);
    await expect(runEnsemble(problem, baseOptions({
      start: { around: { center: new Float64Array(DIM), spread: new Float64Array(DIM) } },
    }))).rejects.toThrow(/start\.around\.spread/);
    await expect(runEnsemble(problem, baseOptions({ stopRule: { minEffectiveSampleSize: 400, maxRHat: 1 } }))).rejects.toThrow(/stopRule\.maxRHat: expected a number > 1, found 1/);
  });

  it('keeps periodic parameters inside their period', async () => {
    // Density periodic in x0 with period [0, 2): cos^2(pi x0) (the N(0, 1) term of x0 taken back
    // out) times N(0, 1) in the others; the walkers start straddling the wrap point.
    const logPosterior = (p: Float64Array, count: number): Float64Array => {
      const out = logStandardNormal(p, count);
      for (let i = 0; i < count; i++) {
        out[i] += 0.5 * p[i * DIM] ** 2 + 2 * Math.log(Math.abs(Math.cos(Math.PI * p[i * DIM])) + 1e-300);
      }
      return out;
    };
    const result = await runEnsemble({ dim: DIM, logPosterior, periodic: [{ lower: 0, upper: 2 }, null, null] }, {
      walkers: 12, seed: 12, proposal: 'differentialEvolution', maxSweeps: 300,
      start: { around: { center: Float64Array.of(1.999, 0, 0), spread: Float64Array.of(0.01, 1, 1) } },
    });
    let wrapped = 0;
    for (let i = 0; i < result.chain.length; i += DIM) {
      expect(result.chain[i]).toBeGreaterThanOrEqual(0);
      expect(result.chain[i]).toBeLessThan(2);
      if (result.chain[i] < 1) wrapped++;
    }
    expect(wrapped).toBeGreaterThan(0);
  });
});

describe('posteriorOnSpace', () => {
  it('adds the log prior and asks the likelihood only for physical points inside the support', async () => {
    const space = new ParameterSpace([
      { name: 'a', prior: { kind: 'uniform', lower: 0, upper: 2 } },
      { name: 'zFixed', prior: { kind: 'fixed', value: 7 } },
      { name: 'angleDeg', prior: { kind: 'periodic', lower: 0, upper: 360 } },
    ]);
    const seen: number[][] = [];
    const problem = posteriorOnSpace(space, (physical, count) => {
      for (let i = 0; i < count; i++) seen.push(Array.from(physical.subarray(3 * i, 3 * i + 3)));
      return Float64Array.from({ length: count }, (_, i) => -physical[3 * i]);
    });
    expect(problem.dim).toBe(2);
    expect(problem.periodic).toEqual([null, { lower: 0, upper: 360 }]);
    const values = await problem.logPosterior(Float64Array.of(1, 10, 3, 20, 0.5, 30), 3);
    expect(seen).toEqual([[1, 7, 10], [0.5, 7, 30]]);
    const logPrior = -Math.log(2) - Math.log(360);
    expect(values[0]).toBeCloseTo(logPrior - 1, 14);
    expect(values[1]).toBe(-Infinity);
    expect(values[2]).toBeCloseTo(logPrior - 0.5, 14);
  });
});

describe('float64 encoding for checkpoints', () => {
  it('round-trips every double exactly, -Infinity and NaN included, through JSON', () => {
    const values = Float64Array.of(-Infinity, Infinity, Number.NaN, -0, 5e-324, Math.PI, -1.7976931348623157e308);
    const back = decodeFloat64(JSON.parse(JSON.stringify(encodeFloat64(values))), 'x', 'f.json');
    expect(Buffer.from(back.buffer).equals(Buffer.from(values.buffer))).toBe(true);
    expect(() => decodeFloat64({ encoding: 'float64-le-base64', length: 3, data: 'AAAA' }, 'x', 'f.json'))
      .toThrow(/f\.json, key x: x: expected 24 bytes, found 3/);
  });
});
