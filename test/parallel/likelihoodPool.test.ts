import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { loadObservedData } from '../../src/data/index.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { LikelihoodPool } from '../../src/parallel/likelihoodPool.js';
import { runModelEvidence } from '../../src/inference/runModelEvidence.js';

// The worker pool must give every point the value the calling thread would compute, at that
// point's index, however the points of one or of several overlapping calls are spread over the
// workers (common practice for deterministic parallel evaluation); a nested run then cannot
// depend on the thread count. Scenario: the invented test lens of test/fixtures/inference.
const configPath = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

describe('the likelihood worker pool', () => {
  const config = loadConfig(configPath);
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-pool-'));
  simulateToFolder(config, folder, { seed: 2, noiseless: false });
  const data = loadObservedData({ folder }, {});

  it('answers overlapping calls exactly as one thread does, each value at its index', async () => {
    const one = await LikelihoodPool.start({ config, data, perturberCount: 1 }, 1);
    const three = await LikelihoodPool.start({ config, data, perturberCount: 1 }, 3);
    try {
      const width = one.width;
      const truth = buildLensSystem(config, { perturberCount: 1 }).configuredValues();
      const calls = [1, 7, 2, 40, 1].map((count, c) => {
        const points = new Float64Array(count * width);
        for (let r = 0; r < count; r++) {
          points.set(truth, r * width);
          points[r * width] *= 1 + 1e-3 * (r + 10 * c);
        }
        return { points, count };
      });
      const expected = await Promise.all(calls.map(({ points, count }) => one.evaluate(points, count)));
      const found = await Promise.all(calls.map(({ points, count }) => three.evaluate(points, count)));
      for (let c = 0; c < calls.length; c++) expect(Array.from(found[c])).toEqual(Array.from(expected[c]));
      expect(three.occupancy.calls).toBe(calls.length);
      expect(three.occupancy.points).toBe(51);
    } finally {
      await one.close();
      await three.close();
    }
  }, 120_000);

  it('holds several models: each answers as a pool of that model alone, counted apart', async () => {
    const tasks = [{ config, data, perturberCount: 0 }, { config, data, perturberCount: 1 }];
    const alone = await Promise.all(tasks.map((task) => LikelihoodPool.start(task, 1)));
    const shared = await LikelihoodPool.start(tasks, 2);
    try {
      const answers = await Promise.all(tasks.map(async (task, k) => {
        const truth = buildLensSystem(config, { perturberCount: task.perturberCount }).configuredValues();
        const width = truth.length;
        const points = new Float64Array(5 * width);
        for (let r = 0; r < 5; r++) {
          points.set(truth, r * width);
          points[r * width] *= 1 + 1e-3 * r;
        }
        expect(shared.model(k).width).toBe(width);
        return [await alone[k].evaluate(points, 5), await shared.model(k).evaluate(points, 5)];
      }));
      for (const [expected, found] of answers) expect(Array.from(found)).toEqual(Array.from(expected));
      expect(shared.model(0).evaluations).toBe(5);
      expect(shared.model(1).evaluations).toBe(5);
      expect(() => shared.model(2)).toThrow(RangeError);
    } finally {
      await Promise.all([...alone, shared].map((pool) => pool.close()));
    }
  }, 120_000);

  it('gives a nested run bit-identical on 1 and 2 threads', async () => {
    const settings = { livePoints: 15, seed: 5, method: 'slice' as const, replacementsPerStep: 2, lnZTolerance: 0.3, maxEvaluations: 600, sliceStepsPerParameter: 1 };
    const single = await runModelEvidence(config, data, 1, { ...settings, threads: 1 });
    const double = await runModelEvidence(config, data, 1, { ...settings, threads: 2 });
    expect(double.threads).toBe(2);
    expect(double.result.lnZ).toBe(single.result.lnZ);
    expect(Array.from(double.result.points)).toEqual(Array.from(single.result.points));
    expect(double.result.chainParallelism).toBe(single.result.chainParallelism);
    expect(double.result.evaluations).toBe(single.result.evaluations);
    expect(double.result.nonFiniteCount).toBe(single.result.nonFiniteCount);
    // On 2 threads each slice chain runs in a worker: one message per chain, not per point.
    expect(double.messages).toBeLessThan(double.result.evaluations / 5);
    expect(single.messages).toBe(0);
  }, 180_000);

  it('gives the importance stage bit-identical on 1 and 2 threads', async () => {
    // Its draws go to the pool in batches; each value comes back at its index (test above).
    const settings = {
      livePoints: 15, seed: 5, method: 'slice' as const, replacementsPerStep: 2, lnZTolerance: 0.5, sliceStepsPerParameter: 1,
      evidence: 'importance' as const, importance: { drawsPerStage: 100, maxStages: 2, maxFinalDraws: 200 },
    };
    const single = await runModelEvidence(config, data, 0, { ...settings, threads: 1 });
    const double = await runModelEvidence(config, data, 0, { ...settings, threads: 2 });
    expect(single.result.evidenceMethod).toBe('importance');
    expect(double.result.lnZ).toBe(single.result.lnZ);
    expect(double.result.lnZError).toBe(single.result.lnZError);
    expect(double.result.evaluations).toBe(single.result.evaluations);
    expect(Array.from(double.result.importance!.samples.points)).toEqual(Array.from(single.result.importance!.samples.points));
  }, 300_000);

  it('gives the same nested run when the next step\'s chains start early on an idle thread', async () => {
    // A thread freed by one of a step's two chains starts the next step's chains early
    // (earlyChains.ts); an early chain is used only if its request is exactly the step's own.
    const settings = { livePoints: 40, seed: 11, method: 'slice' as const, replacementsPerStep: 2, lnZTolerance: 0.3, maxEvaluations: 1500, sliceStepsPerParameter: 1 };
    const single = await runModelEvidence(config, data, 1, { ...settings, threads: 1 });
    const double = await runModelEvidence(config, data, 1, { ...settings, threads: 2 });
    expect(double.result.lnZ).toBe(single.result.lnZ);
    expect(Array.from(double.result.points)).toEqual(Array.from(single.result.points));
    expect(double.result.evaluations).toBe(single.result.evaluations);
    expect(single.result.earlyChains).toEqual({ used: 0, discarded: 0 });
    // Early chains were started and the guesses held: a wrong guess of the next step's inputs
    // would leave the result intact but drop every early chain.
    expect(double.result.earlyChains.used).toBeGreaterThan(5);
    expect(double.result.earlyChains.used).toBeGreaterThan(5 * double.result.earlyChains.discarded);
  }, 180_000);

  it('gives the same nested run with speculative chains (2 points per call) run in workers', async () => {
    const settings = { livePoints: 12, seed: 9, method: 'slice' as const, replacementsPerStep: 3, lnZTolerance: 0.5, maxEvaluations: 400, sliceStepsPerParameter: 1, slicePointsPerChain: 2 };
    const single = await runModelEvidence(config, data, 1, { ...settings, threads: 1 });
    const double = await runModelEvidence(config, data, 1, { ...settings, threads: 2 });
    expect(double.result.lnZ).toBe(single.result.lnZ);
    expect(Array.from(double.result.points)).toEqual(Array.from(single.result.points));
    expect(double.result.evaluations).toBe(single.result.evaluations);
  }, 180_000);
});
