import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadObservedData } from '../data/loadObservedData.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { bestMillisecondsPerCall, forwardScenarios } from './forward.js';
import { LikelihoodPool } from '../parallel/likelihoodPool.js';
import { defaultThreadCount } from '../parallel/workerPool.js';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';
import { machineParallelism } from './machineParallelism.js';
import { fitDefaultNestedSettings } from './nestedRun.js';

const execFileAsync = promisify(execFile);
const benchMain = fileURLToPath(new URL('./main.js', import.meta.url));

/**
 * Wall-clock milliseconds per likelihood through the worker pool with `threads` threads: batches
 * of 64 points near the truth (as a nested-sampling step would send), best of 5 repeats.
 */
async function poolMilliseconds(config: ArcsiftConfig, data: ObservedData, threads: number, model: Float64Array): Promise<number> {
  const pool = await LikelihoodPool.start({ config, data, perturberCount: config.perturbers.length }, threads);
  try {
    const batch = 64;
    const points = new Float64Array(batch * model.length);
    for (let r = 0; r < batch; r++) {
      points.set(model, r * model.length);
      points[r * model.length] *= 1 + 1e-4 * r;
    }
    await pool.evaluate(points, batch);
    let best = Number.POSITIVE_INFINITY;
    for (let repeat = 0; repeat < 5; repeat++) {
      const started = performance.now();
      await pool.evaluate(points, batch);
      best = Math.min(best, (performance.now() - started) / batch);
    }
    return best;
  } finally {
    await pool.close();
  }
}

/** A nested-sampling run of the perturbed model cut at a fixed number of evaluations (see nestedRun.ts). */
interface NestedTiming {
  readonly seconds: number;
  /** CPU seconds of the whole process (every thread). */
  readonly cpuSeconds: number;
  readonly lnZ: number;
  /** likelihood evaluations per new live point (initial draws excluded). */
  readonly evaluationsPerReplacement: number;
  /** messages to worker threads per likelihood evaluation (0 on one thread). */
  readonly messagesPerEvaluation: number;
  /** chain evaluations over each step's longest chain: the speed-up limit of one thread per chain without early chains. */
  readonly chainParallelism: number;
  readonly earlyChains: { readonly used: number; readonly discarded: number };
}

/** A nested run of `scenario` on the data in `folder`, in a fresh process (nestedRun.ts). */
async function nestedTiming(scenario: string, folder: string, threads: number, evaluations: number): Promise<NestedTiming> {
  const { stdout } = await execFileAsync(process.execPath, [
    benchMain, 'nestedRun', '--folder', folder, '--only', scenario, '--threads', String(threads), '--evaluations', String(evaluations),
  ], { maxBuffer: 1 << 20 });
  const lines = stdout.trim().split('\n');
  return JSON.parse(lines[lines.length - 1]) as NestedTiming;
}

/**
 * `npm run bench -- likelihood [--only NAME] [--evaluations N] [--pairs P]`: milliseconds per
 * PixelLikelihood.logLikelihood (the model with the config's perturbers, at the true parameters)
 * on one thread, for the scenarios of the forward benchmark (supersampling 8), each simulated to a
 * temporary folder and read back as a fit reads its data; "allThreads" gives the worker-pool
 * figures: batches of 64 on every core and on one, and a nested run of the perturbed model with
 * the settings of `arcsift fit` (200 live points, 2 replaced per step, 2 slice moves per free
 * parameter), cut at N evaluations (default 100,000: about two minutes on one thread; the
 * demo's own perturbed run, with a quarter of the live points, takes about 170,000), on one
 * thread and on every core, in P alternating pairs (default 2), each run in a fresh process
 * (nestedRun.ts): both start cold, as a user's fit does. Starting two worker threads costs about
 * 0.5 s (mostly loading modules), which weighs on short runs: measured 1.73x at 20,000
 * evaluations, 1.81x at 60,000, 1.89-2.19x at 100,000.
 */
export async function run(args: string[]): Promise<void> {
  const only = benchOption(args, '--only');
  const evaluations = wholeNumberOption(args, '--evaluations', 100_000, 100);
  const pairs = wholeNumberOption(args, '--pairs', 2);
  for (const scenario of forwardScenarios().filter((s) => only === undefined || s.name === only)) {
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-'));
    try {
      simulateToFolder(scenario.config, folder, { seed: 1, noiseless: false });
      const { observation } = scenario.config;
      const data = loadObservedData({ folder }, {
        columns: observation.columns, rows: observation.rows, pixelScaleArcsec: observation.pixelScaleArcsec,
      });
      const likelihood = new PixelLikelihood(scenario.config, data, scenario.config.perturbers.length);
      const model = likelihood.system.configuredValues();
      const { ms, cpuMs, callsPerRepeat } = bestMillisecondsPerCall(() => likelihood.logLikelihood(model));
      const threads = defaultThreadCount();
      const poolOne = await poolMilliseconds(scenario.config, data, 1, model);
      const poolAll = await poolMilliseconds(scenario.config, data, threads, model);
      // Pairs of runs, one thread then all, alternating, as other work on a shared machine comes
      // and goes: the best of each, and each pair's ratio (sorted). Each run in a fresh process.
      let nestedOne = Number.POSITIVE_INFINITY;
      let nestedAll = Number.POSITIVE_INFINITY;
      let figures: NestedTiming | undefined;
      const pairRatios: number[] = [];
      const lnZ = new Set<number>();
      const coresBefore = await machineParallelism(threads);
      for (let repeat = 0; repeat < pairs; repeat++) {
        const one = await nestedTiming(scenario.name, folder, 1, evaluations);
        const all = await nestedTiming(scenario.name, folder, threads, evaluations);
        nestedOne = Math.min(nestedOne, one.seconds);
        nestedAll = Math.min(nestedAll, all.seconds);
        pairRatios.push(one.seconds / all.seconds);
        lnZ.add(one.lnZ).add(all.lnZ);
        figures = all;
      }
      pairRatios.sort((a, b) => a - b);
      const coresAfter = await machineParallelism(threads);
      console.log(JSON.stringify({
        benchmark: 'likelihood',
        scenario: scenario.name,
        msPerCall: Number(ms.toFixed(4)),
        cpuMsPerCall: Number(cpuMs.toFixed(4)),
        oneThread: true,
        repeats: 25,
        callsPerRepeat,
        supersampling: observation.supersampling,
        usedPixels: data.usedPixels.length,
        computedPixels: likelihood.forward.computedPixels.length,
        allThreads: {
          threads,
          msPerCallOneThreadPool: Number(poolOne.toFixed(4)),
          msPerCall: Number(poolAll.toFixed(4)),
          speedUp: Number((poolOne / poolAll).toFixed(2)),
          nestedSecondsOneThread: Number(nestedOne.toFixed(2)),
          nestedSecondsAllThreads: Number(nestedAll.toFixed(2)),
          nestedEvaluations: evaluations,
          nestedSpeedUp: Number((nestedOne / nestedAll).toFixed(2)),
          nestedSpeedUpPairs: pairRatios.map((ratio) => Number(ratio.toFixed(2))),
          // Cores that `threads` busy threads got just before and after the nested runs.
          coresAvailable: [Number(coresBefore.toFixed(2)), Number(coresAfter.toFixed(2))],
          nestedSettings: { ...fitDefaultNestedSettings, maxEvaluations: evaluations },
          // One value when every run gave the same ln Z (results do not depend on threads).
          nestedLnZ: [...lnZ],
          nestedEvaluationsPerReplacement: Number(figures!.evaluationsPerReplacement.toFixed(2)),
          nestedMessagesPerEvaluation: Number(figures!.messagesPerEvaluation.toFixed(3)),
          nestedChainParallelism: Number(figures!.chainParallelism.toFixed(3)),
          nestedEarlyChains: figures!.earlyChains,
          nestedCpuSecondsAllThreads: Number(figures!.cpuSeconds.toFixed(2)),
        },
      }));
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  }
}
