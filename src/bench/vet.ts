import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../config/arcsiftConfig.js';
import { loadObservedData } from '../data/loadObservedData.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { defaultThreadCount } from '../parallel/workerPool.js';
import { vetFlags } from '../vet/vetFlags.js';
import type { FlagCandidate } from '../vet/flagCandidate.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';

const demoPath = fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url));

/**
 * `npm run bench -- vet`: seconds to vet 5 flags on the demo scenario (one shared smooth fit and
 * five windowed perturbed fits, the demo's quick settings: 25 live points, one slice move per
 * free parameter), on one thread and on every core (`--threads N` runs N alone). Flags: the
 * planted subhalo, three other places on the arc and one off it.
 */
export async function run(args: string[]): Promise<void> {
  const only = benchOption(args, '--threads') === undefined ? undefined : wholeNumberOption(args, '--threads', 1);
  const config = loadConfig(demoPath);
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-vet-'));
  try {
    simulateToFolder(config, folder, { seed: 1, noiseless: false });
    const data = loadObservedData({ folder }, {});
    const positions: [number, number][] = [[0.72, 0.92], [-1.0, -0.6], [1.25, -0.3], [-0.9, 0.8], [0.0, 1.9]];
    const candidates: FlagCandidate[] = positions.map(([x, y], k) => ({
      id: String(k + 1), xArcsec: x, yArcsec: y, score: undefined, origin: `bench flag ${k + 1}`,
    }));
    const threadCounts = only === undefined ? [...new Set([1, defaultThreadCount()])] : [only];
    for (const threads of threadCounts) {
      const started = performance.now();
      const result = await vetFlags(config, data, candidates, {
        evidence: () => ({
          livePoints: 25, seed: 1, method: 'slice', replacementsPerStep: 2, lnZTolerance: 0.1, threads, sliceStepsPerParameter: 1,
        }),
      });
      console.log(JSON.stringify({
        benchmark: 'vet', scenario: 'demo', candidates: candidates.length, threads,
        seconds: Number(((performance.now() - started) / 1000).toFixed(1)),
        lnBayesFactors: result.candidates.map((c) => Number(c.lnBayesFactor.toFixed(2))),
      }));
    }
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
