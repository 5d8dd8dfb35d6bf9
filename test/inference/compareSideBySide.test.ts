import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { loadObservedData } from '../../src/data/index.js';
import { comparisonSideBySide, compareModels } from '../../src/inference/compareModels.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';

// Own determinism contract: with two threads the smooth and perturbed runs go side by side,
// sharing one pool of workers that hold both models; one after another on one thread, every
// evidence must be the same number, since each run's path depends on its seed alone. Invented scenario of
// test/fixtures/inference/small-lens.yaml, runs cut at 600 evaluations to stay quick.
const fixture = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

describe('compare with the two models side by side', () => {
  it('gives the same ln Z on two threads as one after another on one', async () => {
    const config = loadConfig(fixture);
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-side-by-side-'));
    simulateToFolder(config, folder, { seed: 13, noiseless: false });
    const data = loadObservedData({ folder }, {});
    const run = (threads: number) => ({ livePoints: 20, seed: 5, method: 'auto' as const, replacementsPerStep: 2, lnZTolerance: 0.3, threads, maxEvaluations: 600 });
    expect(comparisonSideBySide({ smooth: run(2), perturbed: run(2) })).toBe(true);
    expect(comparisonSideBySide({ smooth: run(1), perturbed: run(1) })).toBe(false);
    const started: string[] = [];
    const sequential = await compareModels(config, data, { smooth: run(1), perturbed: run(1) });
    const sideBySide = await compareModels(config, data, { smooth: run(2), perturbed: run(2), onModelStart: (label) => started.push(label) });
    expect(started).toEqual(['smooth', 'perturbed']);
    expect(sideBySide.smooth.threads).toBe(2);
    expect(sideBySide.perturbed.threads).toBe(2);
    // Slice chains went to the shared workers, a message per chain rather than per point.
    expect(sideBySide.perturbed.messages).toBeGreaterThan(0);
    expect(sideBySide.perturbed.messages).toBeLessThan(sideBySide.perturbed.result.evaluations / 3);
    expect(sideBySide.smooth.result.lnZ).toBe(sequential.smooth.result.lnZ);
    expect(sideBySide.perturbed.result.lnZ).toBe(sequential.perturbed.result.lnZ);
    expect(sideBySide.lnBayesFactor).toBe(sequential.lnBayesFactor);
  }, 120_000);
});
