import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { gaussianShellsLnEvidence, gaussianShellsProblem } from '../../../src/sampling/nested/problems/gaussianShells.js';
import { twistedGaussianLnEvidence, twistedGaussianProblem } from '../../../src/sampling/nested/problems/twistedGaussian.js';
import { mergeEvidenceRuns } from '../../../src/sampling/nested/mergeEvidenceRuns.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';

// Independent runs of one model merged; checked against the exact ln Z of the Gaussian shells
// (radial integral) and of the twisted Gaussian (-ln box volume), within 3 merged errors.
describe('merging independent runs', () => {
  it('nested evidence: two runs of 100 live points give the error of one run of 200, and the truth within 3 errors', async () => {
    const problem = gaussianShellsProblem(2);
    const runs = await Promise.all([1, 2].map((seed) => runNested(problem, { livePoints: 100, seed, method: 'ellipsoids', evidence: 'nested' })));
    const merged = mergeEvidenceRuns(runs);
    // Skilling's sqrt(H / N): both runs have about the same H, so the merged error is their mean
    // error / sqrt(2) to within the spread of H between runs (a few per cent).
    const meanError = (runs[0].lnZError + runs[1].lnZError) / 2;
    expect(merged.lnZError / (meanError / Math.SQRT2)).toBeGreaterThan(0.95);
    expect(merged.lnZError / (meanError / Math.SQRT2)).toBeLessThan(1.05);
    expect(Math.abs(merged.lnZ - gaussianShellsLnEvidence(2))).toBeLessThan(3 * merged.lnZError);
    expect(merged.count).toBe(runs[0].count + runs[1].count);
    expect(merged.evaluations).toBe(runs[0].evaluations + runs[1].evaluations);
    let total = 0;
    for (let i = 0; i < merged.count; i++) total += Math.exp(merged.lnWeight[i]);
    expect(Math.abs(total - 1)).toBeLessThan(1e-12);
    expect(merged.insertionRank.ranks).toBe(runs[0].insertionRank.ranks + runs[1].insertionRank.ranks);
  });

  it('importance evidence: the pooled estimate is within 3 errors of the truth, with a smaller error than either run', async () => {
    const problem = twistedGaussianProblem(4);
    const runs = await Promise.all([3, 4].map((seed) => runNested(problem, {
      livePoints: 30, seed, method: 'slice', slice: { steps: 4 }, evidence: 'importance', importance: { drawsPerStage: 600 },
    })));
    const merged = mergeEvidenceRuns(runs);
    expect(merged.evidenceMethod).toBe('importance');
    expect(merged.lnZError).toBeLessThan(Math.min(runs[0].lnZError, runs[1].lnZError));
    expect(Math.abs(merged.lnZ - twistedGaussianLnEvidence(4))).toBeLessThan(3 * merged.lnZError);
  }, 60_000);

  it('refuses runs of different methods or models, naming the run', async () => {
    const nested = await runNested(gaussianShellsProblem(2), { livePoints: 50, seed: 5, method: 'ellipsoids', evidence: 'nested' });
    const importance = await runNested(gaussianShellsProblem(2), { livePoints: 50, seed: 5, method: 'ellipsoids', evidence: 'importance', importance: { drawsPerStage: 300 } });
    const other = await runNested(gaussianShellsProblem(3), { livePoints: 50, seed: 5, method: 'ellipsoids', evidence: 'nested' });
    expect(() => mergeEvidenceRuns([nested, importance])).toThrow(InputError);
    expect(() => mergeEvidenceRuns([nested, importance])).toThrow(/run 2/);
    expect(() => mergeEvidenceRuns([nested, other])).toThrow(/run 2 has 3 parameters/);
  }, 60_000);
});
