import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadObservedData } from '../data/loadObservedData.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { simulateToFolder } from '../model/simulateToFolder.js';
import { bestMillisecondsPerCall, forwardScenarios } from './forward.js';
import { LikelihoodPool, defaultThreadCount } from '../parallel/likelihoodPool.js';
import { runModelEvidence } from '../inference/runModelEvidence.js';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';
import { machineParallelism } from './machineParallelism.js';

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

/** A nested-sampling run of the perturbed model cut at a fixed number of evaluations. */
interface NestedTiming {
  readonly seconds: number;
  /** likelihood evaluations per new live point (initial draws excluded). */
  readonly evaluationsPerReplacement: number;
  /** messages to worker threads per likelihood evaluation (0 on one thread). */
  readonly messagesPerEvaluation: number;
  /** chain evaluations over each step's longest chain: the speed-up limit of one thread per chain. */
  readonly chainParallelism: number;
}

/**
 * Seconds for a nested-sampling run of the perturbed model with the command line's sampler
 * settings (slice sampling, 25 live points as in the demo, 2 live points replaced per step, 1
 * slice move per free parameter), cut at `evaluations`, with the run's deterministic
 * figures (the same for any thread count).
 */
async function nestedTiming(config: ArcsiftConfig, data: ObservedData, threads: number, evaluations: number): Promise<NestedTiming> {
  const started = performance.now();
  const run = await runModelEvidence(config, data, config.perturbers.length, {
    livePoints: 25, seed: 1, method: 'slice', replacementsPerStep: 2, sliceStepsPerParameter: 1, lnZTolerance: 0.1, threads, maxEvaluations: evaluations,
  });
  return {
    seconds: (performance.now() - started) / 1000,
    evaluationsPerReplacement: 1 / run.result.efficiency,
    messagesPerEvaluation: run.messages / run.result.evaluations,
    chainParallelism: run.result.chainParallelism,
  };
}

/**
 * `npm run bench -- likelihood`: milliseconds per PixelLikelihood.logLikelihood (the model with
 * the config's perturbers, at the true parameters) on one thread, for the scenarios of the
 * forward benchmark (supersampling 8), each simulated to a temporary folder and read back as a
 * fit reads its data (`--only demo` for one scenario); "allThreads" gives the worker-pool
 * figures (batches of 64, and a nested run of the perturbed model cut at `--evaluations N`,
 * default 20,000, see nestedTiming) on every core and on one. Worker threads start cold (~0.7 s
 * to start two, then unoptimised code for a while) while the calling thread stays warm from
 * one timed run to the next, so short runs understate the speed-up of a real fit.
 */
export async function run(args: string[]): Promise<void> {
  const only = benchOption(args, '--only');
  const evaluations = wholeNumberOption(args, '--evaluations', 20_000, 100);
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
      // Two pairs, one thread then all, alternating, as other work on a shared machine comes
      // and goes: the best of each, and each pair's ratio (sorted).
      let nestedOne = Number.POSITIVE_INFINITY;
      let nestedAll = Number.POSITIVE_INFINITY;
      let figures: NestedTiming | undefined;
      const pairRatios: number[] = [];
      const coresBefore = await machineParallelism(threads);
      for (let repeat = 0; repeat < 2; repeat++) {
        const one = await nestedTiming(scenario.config, data, 1, evaluations);
        const all = await nestedTiming(scenario.config, data, threads, evaluations);
        nestedOne = Math.min(nestedOne, one.seconds);
        nestedAll = Math.min(nestedAll, all.seconds);
        pairRatios.push(one.seconds / all.seconds);
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
          nestedEvaluationsPerReplacement: Number(figures!.evaluationsPerReplacement.toFixed(2)),
          nestedMessagesPerEvaluation: Number(figures!.messagesPerEvaluation.toFixed(3)),
          nestedChainParallelism: Number(figures!.chainParallelism.toFixed(3)),
        },
      }));
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  }
}
