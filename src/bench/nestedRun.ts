import { loadObservedData } from '../data/loadObservedData.js';
import { runModelEvidence } from '../inference/runModelEvidence.js';
import { runDefaults } from '../settings/runDefaults.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';
import { forwardScenarios } from './forward.js';

/** The settings `arcsift fit` runs nested sampling with by default (runDefaults.nested). */
export const fitDefaultNestedSettings = runDefaults.nested;

/**
 * `npm run bench -- nestedRun --folder DIR [--only NAME] [--threads N] [--evaluations E]`: one
 * nested-sampling run of a scenario's perturbed model on the data simulated in DIR, with the
 * settings of `arcsift fit` (fitDefaultNestedSettings), cut at E evaluations (default 20,000),
 * timed in this process from the start of the run (worker threads included) to its end: one JSON
 * line. The likelihood benchmark runs it in fresh processes, so that one thread and all threads
 * both start cold, as a user's `fit` does.
 */
export async function run(args: string[]): Promise<void> {
  const folder = benchOption(args, '--folder');
  if (folder === undefined) throw new Error('nestedRun: --folder DIR (the simulated data) is required');
  const name = benchOption(args, '--only') ?? 'demo';
  const scenario = forwardScenarios().find((s) => s.name === name);
  if (scenario === undefined) throw new Error(`nestedRun: no scenario named ${JSON.stringify(name)}`);
  const threads = wholeNumberOption(args, '--threads', 1);
  const evaluations = wholeNumberOption(args, '--evaluations', 20_000, 100);
  const { observation } = scenario.config;
  const data = loadObservedData({ folder }, {
    columns: observation.columns, rows: observation.rows, pixelScaleArcsec: observation.pixelScaleArcsec,
  });
  const started = performance.now();
  const cpuStart = process.cpuUsage();
  const run = await runModelEvidence(scenario.config, data, scenario.config.perturbers.length, {
    ...fitDefaultNestedSettings, threads, maxEvaluations: evaluations,
  });
  const cpu = process.cpuUsage(cpuStart);
  console.log(JSON.stringify({
    benchmark: 'nestedRun',
    scenario: name,
    threads,
    seconds: (performance.now() - started) / 1000,
    cpuSeconds: (cpu.user + cpu.system) / 1e6,
    lnZ: run.result.lnZ,
    evaluations: run.result.evaluations,
    evaluationsPerReplacement: 1 / run.result.efficiency,
    messagesPerEvaluation: run.messages / run.result.evaluations,
    chainParallelism: run.result.chainParallelism,
    earlyChains: run.result.earlyChains,
  }));
}
