import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runEnsemble } from '../../src/sampling/ensemble/index.js';
import type { NestedProblem } from '../../src/sampling/nested/nestedProblem.js';
import { runNested } from '../../src/sampling/nested/runNested.js';
import type { RunTallies } from '../../src/sampling/runTallies.js';

// A sampler keeps a problem's RunTallies in its checkpoints, so that a run stopped and resumed
// reports the counts of its whole history: the same as a run never stopped (whose evaluations
// are the same, point for point, by the resume design these samplers are tested for elsewhere).
// The tallies here count the evaluated points with x < 0.3 ("low") and the others ("high").
const folder = mkdtempSync(join(tmpdir(), 'arcsift-tallies-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

class CountingTallies implements RunTallies {
  counts: Record<string, number> = { low: 0, high: 0 };
  restored: Record<string, number> | null = null;
  read(): Record<string, number> {
    return { ...this.counts };
  }
  restore(saved: Readonly<Record<string, number>>): void {
    this.restored = { ...saved };
    this.counts = { ...saved };
  }
  count(points: Float64Array, count: number, width: number): void {
    for (let r = 0; r < count; r++) this.counts[points[r * width] < 0.3 ? 'low' : 'high']++;
  }
}

function nestedProblem(tallies: CountingTallies): NestedProblem {
  return {
    dim: 2,
    physicalDim: 2,
    transform(unit, out) {
      out.set(unit);
    },
    logLikelihood(points, count) {
      tallies.count(points, count, 2);
      const lnL = new Float64Array(count);
      for (let n = 0; n < count; n++) lnL[n] = -0.5 * (((points[2 * n] - 0.5) / 0.1) ** 2 + ((points[2 * n + 1] - 0.5) / 0.1) ** 2);
      return lnL;
    },
    tallies,
  };
}

describe('RunTallies in checkpoints', () => {
  it('nested sampling: a run stopped by its evaluation limit and resumed ends with the counts of an uninterrupted run', async () => {
    const options = { livePoints: 40, seed: 7, method: 'slice' as const, evidence: 'nested' as const };
    const whole = new CountingTallies();
    const wholeRun = await runNested(nestedProblem(whole), options);

    const path = join(folder, 'nested.json');
    const first = new CountingTallies();
    const part = await runNested(nestedProblem(first), { ...options, maxEvaluations: 1500, checkpoint: { path, everySeconds: 3600 } });
    expect(part.stopReason).toBe('maxEvaluations');
    const second = new CountingTallies();
    const resumed = await runNested(nestedProblem(second), { ...options, checkpoint: { path, everySeconds: 3600 }, resume: true });
    expect(second.restored).toEqual(first.counts);
    expect(resumed.evaluations).toBe(wholeRun.evaluations);
    expect(second.counts).toEqual(whole.counts);
    expect(whole.counts.low + whole.counts.high).toBe(wholeRun.evaluations);

    // A checkpoint whose tallies are not whole counts is refused, naming the file and key.
    const text = readFileSync(path, 'utf8');
    writeFileSync(path, text.replace(/"tallies":\{[^}]*\}/, '"tallies":{"low":-2,"high":"many"}'));
    await expect(runNested(nestedProblem(new CountingTallies()), { ...options, checkpoint: { path, everySeconds: 3600 }, resume: true }))
      .rejects.toThrow(/nested\.json.*tallies.*expected an object of whole counts/s);
  });

  it('ensemble MCMC: the same through its checkpoint', async () => {
    const problem = (tallies: CountingTallies) => ({
      dim: 2,
      logPosterior: (points: Float64Array, count: number) => {
        tallies.count(points, count, 2);
        const out = new Float64Array(count);
        for (let n = 0; n < count; n++) out[n] = -0.5 * (points[2 * n] ** 2 + points[2 * n + 1] ** 2);
        return out;
      },
      tallies,
    });
    const options = {
      walkers: 8, seed: 11, start: { around: { center: new Float64Array(2), spread: new Float64Array(2).fill(0.5) } },
      proposal: [{ proposal: 'stretch' as const, weight: 1 }], stopRule: { minEffectiveSampleSize: 1e9, maxRHat: 1.01 }, checkEverySweeps: 50,
    };
    const whole = new CountingTallies();
    await runEnsemble(problem(whole), { ...options, maxSweeps: 200 });
    const path = join(folder, 'ensemble.json');
    const first = new CountingTallies();
    await runEnsemble(problem(first), { ...options, maxSweeps: 80, checkpoint: { path, everySeconds: 3600 } });
    const second = new CountingTallies();
    await runEnsemble(problem(second), { ...options, maxSweeps: 200, checkpoint: { path, everySeconds: 3600 }, resume: true });
    expect(second.restored).toEqual(first.counts);
    expect(second.counts).toEqual(whole.counts);
    expect(whole.counts.low + whole.counts.high).toBe(8 + 200 * 8);
  });
});
