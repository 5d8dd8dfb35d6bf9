import { copyFileSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import type { NestedOptions, NestedProblem, NestedResult } from '../../../src/sampling/nested/nestedProblem.js';
import { twistedGaussianProblem } from '../../../src/sampling/nested/problems/twistedGaussian.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';

const folder = mkdtempSync(join(tmpdir(), 'arcsift-importance-resume-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

const options: NestedOptions = {
  livePoints: 30, seed: 7, method: 'slice', slice: { steps: 4 }, evidence: 'importance',
  importance: { drawsPerStage: 600, maxFinalDraws: 3000 },
};

/** The problem, calling `hook` with the evaluations so far before each likelihood call. */
function watched(problem: NestedProblem, hook: (evaluations: number) => void): NestedProblem {
  let evaluations = 0;
  return {
    ...problem,
    async logLikelihood(points, count) {
      hook(evaluations);
      evaluations += count;
      await Promise.resolve();
      return problem.logLikelihood(points, count);
    },
  };
}

function expectIdentical(a: NestedResult, b: NestedResult): void {
  expect(a.evidenceMethod).toBe('importance');
  expect(Object.is(a.lnZ, b.lnZ)).toBe(true);
  expect(Object.is(a.lnZError, b.lnZError)).toBe(true);
  expect(Object.is(a.nestedLnZ, b.nestedLnZ)).toBe(true);
  expect(a.evaluations).toBe(b.evaluations);
  expect(a.importance!.stages).toEqual(b.importance!.stages);
  expect(Buffer.from(a.importance!.samples.lnWeight.buffer).equals(Buffer.from(b.importance!.samples.lnWeight.buffer))).toBe(true);
  expect(Buffer.from(a.importance!.samples.unitPoints.buffer).equals(Buffer.from(b.importance!.samples.unitPoints.buffer))).toBe(true);
}

describe('checkpoint and resume through the importance stage', () => {
  it('a run stopped inside the importance stage, resumed from its last or an older checkpoint, matches an uninterrupted run bit for bit', async () => {
    const problem = twistedGaussianProblem(4);
    const reference = await runNested(problem, options);
    expect(reference.stopReason).toBe('converged');
    const nestedEvaluations = reference.evaluations - reference.importance!.evaluations;
    expect(reference.importance!.stages.length).toBeGreaterThan(2);

    const path = join(folder, 'run.json');
    const earlier = join(folder, 'earlier.json');
    const signal = { stopRequested: false };
    let copied = false;
    // Copy the checkpoint written after an early importance batch (a process killed between
    // checkpoints resumes from such a file), then stop the run a few batches later.
    const interrupted = await runNested(watched(problem, (evaluations) => {
      if (!copied && evaluations > nestedEvaluations + 300) {
        copyFileSync(path, earlier);
        copied = true;
      }
      if (evaluations > nestedEvaluations + 1500) signal.stopRequested = true;
    }), { ...options, checkpoint: { path, everyIterations: 20 }, signal });
    expect(interrupted.stopReason).toBe('interrupted');
    expect(interrupted.evidenceMethod).toBe('nested');
    expect(copied).toBe(true);
    expect(existsSync(path)).toBe(true);

    const resumed = await runNested(problem, { ...options, checkpoint: { path, everyIterations: 20 }, resume: true });
    expect(resumed.stopReason).toBe('converged');
    expectIdentical(resumed, reference);
    const fromEarlier = await runNested(problem, { ...options, checkpoint: { path: earlier }, resume: true });
    expectIdentical(fromEarlier, reference);
  }, 120_000);

  it('refuses to resume with other importance settings or the other evidence method, naming the key', async () => {
    const path = join(folder, 'run.json');
    await expect(runNested(twistedGaussianProblem(4), { ...options, importance: { drawsPerStage: 700 }, checkpoint: { path }, resume: true }))
      .rejects.toThrow(InputError);
    await expect(runNested(twistedGaussianProblem(4), { ...options, importance: { drawsPerStage: 700 }, checkpoint: { path }, resume: true }))
      .rejects.toThrow(/key importance/);
    // Clusters kept on, as the importance run had them by default, so that only the method differs.
    await expect(runNested(twistedGaussianProblem(4), { ...options, evidence: 'nested', slice: { steps: 4, clusters: true }, checkpoint: { path }, resume: true }))
      .rejects.toThrow(/key evidence/);
  });
});
