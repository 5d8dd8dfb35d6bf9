import { copyFileSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import type { NestedOptions, NestedProblem, NestedResult } from '../../../src/sampling/nested/nestedProblem.js';
import { gaussianShellsProblem } from '../../../src/sampling/nested/problems/gaussianShells.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';

const folder = mkdtempSync(join(tmpdir(), 'arcsift-nested-resume-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

/** A likelihood answering asynchronously after a varying delay, as a worker pool would. */
function jittered(problem: NestedProblem): NestedProblem {
  let call = 0;
  return {
    ...problem,
    async logLikelihood(points, count) {
      call++;
      if (call % 97 === 0) await new Promise((resolve) => setTimeout(resolve, 1));
      else await Promise.resolve();
      return problem.logLikelihood(points, count);
    },
  };
}

function expectIdentical(a: NestedResult, b: NestedResult): void {
  expect(Object.is(a.lnZ, b.lnZ)).toBe(true);
  expect(Object.is(a.lnZErrorSimulated, b.lnZErrorSimulated)).toBe(true);
  expect(a.iterations).toBe(b.iterations);
  expect(a.evaluations).toBe(b.evaluations);
  expect(a.insertionRank).toEqual(b.insertionRank);
  expect(Buffer.from(a.points.buffer).equals(Buffer.from(b.points.buffer))).toBe(true);
  expect(Buffer.from(a.lnWeight.buffer).equals(Buffer.from(b.lnWeight.buffer))).toBe(true);
  expect(Buffer.from(a.equalWeight(300, 9).buffer).equals(Buffer.from(b.equalWeight(300, 9).buffer))).toBe(true);
}

// A correlated 3-D Gaussian on the unit cube for the slice sampler, with one periodic coordinate.
const gaussian: NestedProblem = {
  dim: 3,
  physicalDim: 3,
  periodic: [false, false, true],
  transform(unit, out) {
    out.set(unit);
  },
  logLikelihood(points, count) {
    const lnL = new Float64Array(count);
    for (let n = 0; n < count; n++) {
      const x = (points[3 * n] - 0.4) / 0.1;
      const y = (points[3 * n + 1] - 0.6) / 0.1;
      const z = (points[3 * n + 2] - 0.5) / 0.2;
      lnL[n] = -0.5 * (x * x + y * y - 1.6 * x * y) / (1 - 0.64) - 0.5 * z * z;
    }
    return lnL;
  },
};

const cases: Array<{ name: string; problem: NestedProblem; options: NestedOptions }> = [
  { name: 'ellipsoids', problem: gaussianShellsProblem(2), options: { livePoints: 100, seed: 21, method: 'ellipsoids', replacementsPerStep: 3, evidence: 'nested' } },
  { name: 'slice', problem: gaussian, options: { livePoints: 50, seed: 22, method: 'slice', replacementsPerStep: 2, evidence: 'nested' } },
];

describe('checkpoint and resume', () => {
  for (const { name, problem, options } of cases) {
    it(`${name}: an interrupted run, resumed, matches an uninterrupted run bit for bit`, async () => {
      const reference = await runNested(jittered(problem), options);
      expect(reference.stopReason).toBe('converged');

      const path = join(folder, `${name}.json`);
      const earlier = join(folder, `${name}-earlier.json`);
      const signal = { stopRequested: false };
      let reports = 0;
      const interrupted = await runNested(jittered(problem), {
        ...options,
        checkpoint: { path, everyIterations: 30 },
        signal,
        onProgress: () => {
          reports++;
          // Keep a copy of an older periodic checkpoint: resuming from it mimics a process killed
          // between checkpoints; then ask the run to stop (an in-process kill).
          if (reports === 2) copyFileSync(path, earlier);
          if (reports === 4) signal.stopRequested = true;
        },
      });
      expect(interrupted.stopReason).toBe('interrupted');
      expect(interrupted.iterations).toBeLessThan(reference.iterations);
      expect(existsSync(path)).toBe(true);

      const resumed = await runNested(jittered(problem), { ...options, checkpoint: { path, everyIterations: 30 }, resume: true });
      expect(resumed.stopReason).toBe('converged');
      expectIdentical(resumed, reference);

      const fromEarlier = await runNested(problem, { ...options, checkpoint: { path: earlier }, resume: true });
      expectIdentical(fromEarlier, reference);

      // Resuming a finished run's checkpoint returns the same result again.
      const again = await runNested(problem, { ...options, checkpoint: { path }, resume: true });
      expectIdentical(again, reference);
    });
  }

  it('refuses a checkpoint written with other settings, naming the file and key', async () => {
    const path = join(folder, 'ellipsoids.json');
    await expect(
      runNested(gaussianShellsProblem(2), { livePoints: 100, seed: 99, method: 'ellipsoids', replacementsPerStep: 3, evidence: 'nested', checkpoint: { path }, resume: true }),
    ).rejects.toThrow(InputError);
    await expect(
      runNested(gaussianShellsProblem(2), { livePoints: 100, seed: 99, method: 'ellipsoids', replacementsPerStep: 3, evidence: 'nested', checkpoint: { path }, resume: true }),
    ).rejects.toThrow(/key seed/);
  });
});
