import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../config/arcsiftConfig.js';
import { loadObservedData } from '../data/loadObservedData.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { defaultThreadCount } from '../parallel/workerPool.js';
import { compareModels } from '../inference/compareModels.js';
import { wholeNumberOption } from './benchOptions.js';
import { machineParallelism } from './machineParallelism.js';
import { runDefaults } from '../settings/runDefaults.js';

const demoPath = fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url));

/**
 * `npm run bench -- compare [--evaluations N] [--pairs P]`: seconds for the demo's comparison
 * (nested sampling of the smooth and the perturbed model with the demo's settings: 50 live
 * points, one slice move per free parameter), each run cut at N evaluations (default 10,000),
 * on one thread and on every core, in P alternating pairs (default 2): the speed-up of the main
 * job as a user runs it. The cut runs are the same on any thread count (same ln Z printed).
 */
export async function run(args: string[]): Promise<void> {
  const maxEvaluations = wholeNumberOption(args, '--evaluations', 10_000);
  const pairs = wholeNumberOption(args, '--pairs', 2);
  const config = loadConfig(demoPath);
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-compare-'));
  try {
    simulateToFolder(config, folder, { seed: 1, noiseless: false });
    const data = loadObservedData({ folder }, {});
    const threads = defaultThreadCount();
    const time = async (count: number) => {
      const settings = {
        ...runDefaults.nested, livePoints: runDefaults.demo.livePoints, sliceStepsPerParameter: runDefaults.demo.sliceStepsPerParameter,
        method: 'slice' as const, threads: count, maxEvaluations,
      };
      const started = performance.now();
      const result = await compareModels(config, data, { smooth: settings, perturbed: settings });
      return { seconds: (performance.now() - started) / 1000, lnBayesFactor: result.lnBayesFactor };
    };
    const coresBefore = await machineParallelism(threads);
    const ratios: number[] = [];
    let bestOne = Number.POSITIVE_INFINITY;
    let bestAll = Number.POSITIVE_INFINITY;
    let lnB: number[] = [];
    for (let pair = 0; pair < pairs; pair++) {
      const one = await time(1);
      const all = await time(threads);
      bestOne = Math.min(bestOne, one.seconds);
      bestAll = Math.min(bestAll, all.seconds);
      ratios.push(one.seconds / all.seconds);
      lnB = [one.lnBayesFactor, all.lnBayesFactor];
    }
    const coresAfter = await machineParallelism(threads);
    console.log(JSON.stringify({
      benchmark: 'compare', scenario: 'demo', evaluationsPerRun: maxEvaluations, threads,
      secondsOneThread: Number(bestOne.toFixed(2)),
      secondsAllThreads: Number(bestAll.toFixed(2)),
      speedUp: Number((bestOne / bestAll).toFixed(2)),
      speedUpPairs: ratios.sort((a, b) => a - b).map((ratio) => Number(ratio.toFixed(2))),
      coresAvailable: [Number(coresBefore.toFixed(2)), Number(coresAfter.toFixed(2))],
      lnBayesFactorOneAndAllThreads: lnB.map((value) => Number(value.toFixed(4))),
    }));
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
