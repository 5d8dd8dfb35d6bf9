// `npm run bench -- evidence [--repeats R] [--demo-repeats D] [--only shells|twisted|demo] [--threads T]`
// (`--make-reference` instead runs the demo reference with referenceSettings and prints its JSON):
// the evidence of issue 14's three scenarios by importance sampling after a short nested run, one
// JSON line per scenario: mean evaluations, mean ln Z, mean quoted error, the scatter of ln Z over
// the repeats (seeds 1..R), the reference value, scatter / mean error and the rms of each run's
// z-score against the reference (honest errors give about 1).
// The 20-d Gaussian shells and the 10-d twisted Gaussian against their exact values; the demo's
// perturbed model against the reference run in src/bench/fixtures/demoPerturbedReference.json
// (its settings and the command that made it are in the file).
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadObservedData } from '../data/loadObservedData.js';
import { runModelEvidence, type EvidenceSettings } from '../inference/runModelEvidence.js';
import { demoConfigPath } from '../inference/runDemo.js';
import { loadConfig } from '../config/arcsiftConfig.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { gaussianShellsLnEvidence, gaussianShellsProblem } from '../sampling/nested/problems/gaussianShells.js';
import { twistedGaussianLnEvidence, twistedGaussianProblem } from '../sampling/nested/problems/twistedGaussian.js';
import { runNested } from '../sampling/nested/runNested.js';
import type { NestedResult } from '../sampling/nested/nestedProblem.js';
import { runDefaults } from '../settings/runDefaults.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';

/** The demo perturbed model's reference: settings and result of a long run (see the file). */
const referencePath = new URL('../../src/bench/fixtures/demoPerturbedReference.json', import.meta.url);

/**
 * The reference run's settings: twice the demo's live points, and a final importance stage drawn
 * for an error of 0.02 (its nested sum, with its own error, is kept beside it as a check made
 * without importance sampling).
 */
export const referenceSettings = {
  livePoints: 2 * runDefaults.demo.livePoints,
  sliceStepsPerParameter: 1,
  seed: 101,
  method: 'slice',
  replacementsPerStep: runDefaults.nested.replacementsPerStep,
  lnZTolerance: runDefaults.nested.lnZTolerance,
  evidence: 'importance',
  importance: { targetLnZError: 0.02, maxFinalDraws: 100_000 },
} as const;

/** The settings of the demo scenario's runs here: the demo's live points and slice steps, importance evidence. */
export const demoEvidenceSettings = {
  livePoints: runDefaults.demo.livePoints,
  sliceStepsPerParameter: runDefaults.demo.sliceStepsPerParameter,
  seed: 1,
  method: 'slice',
  replacementsPerStep: runDefaults.nested.replacementsPerStep,
  lnZTolerance: runDefaults.nested.lnZTolerance,
  evidence: 'importance',
} as const;

interface Run {
  readonly evaluations: number;
  readonly lnZ: number;
  readonly lnZError: number;
  readonly nestedLnZ: number;
  readonly effectiveSampleSize: number;
  readonly suspect: boolean;
  readonly seconds: number;
}

function runOf(result: NestedResult, seconds: number): Run {
  return {
    evaluations: result.evaluations,
    lnZ: result.lnZ,
    lnZError: result.lnZError,
    nestedLnZ: result.nestedLnZ,
    effectiveSampleSize: result.importance?.final.effectiveSampleSize ?? Number.NaN,
    suspect: result.importance?.suspect ?? true,
    seconds,
  };
}

function mean(values: readonly number[]): number {
  return values.reduce((a, b) => a + b, 0) / values.length;
}

function standardDeviation(values: readonly number[]): number {
  const m = mean(values);
  return Math.sqrt(values.reduce((a, b) => a + (b - m) ** 2, 0) / Math.max(1, values.length - 1));
}

function report(scenario: string, settings: object, runs: readonly Run[], reference: number, referenceError: number): void {
  const lnZ = runs.map((r) => r.lnZ);
  const error = mean(runs.map((r) => r.lnZError));
  const scatter = standardDeviation(lnZ);
  const round = (v: number, digits = 4) => Number(v.toFixed(digits));
  console.log(JSON.stringify({
    benchmark: 'evidence',
    scenario,
    settings,
    repeats: runs.length,
    evaluations: Math.round(mean(runs.map((r) => r.evaluations))),
    maxEvaluations: Math.max(...runs.map((r) => r.evaluations)),
    lnZ: round(mean(lnZ)),
    lnZError: round(error),
    scatter: round(scatter),
    scatterOverError: round(scatter / error, 2),
    // root mean square of (ln Z_i - reference) / sqrt(error_i^2 + referenceError^2): about 1 for
    // honest errors, and fair when the quoted errors differ from run to run.
    rmsZ: round(Math.sqrt(mean(runs.map((r) => (r.lnZ - reference) ** 2 / (r.lnZError ** 2 + referenceError ** 2)))), 2),
    reference: round(reference),
    referenceError: round(referenceError),
    meanOffsetOverError: round((mean(lnZ) - reference) / Math.hypot(error / Math.sqrt(runs.length), referenceError), 2),
    nestedLnZ: round(mean(runs.map((r) => r.nestedLnZ))),
    suspectRuns: runs.filter((r) => r.suspect).length,
    effectiveSampleSize: Math.round(mean(runs.map((r) => r.effectiveSampleSize))),
    seconds: round(mean(runs.map((r) => r.seconds)), 1),
    runs: runs.map((r) => ({ evaluations: r.evaluations, lnZ: round(r.lnZ), lnZError: round(r.lnZError) })),
  }));
}

async function analytic(name: string, build: () => ReturnType<typeof gaussianShellsProblem>, truth: number, steps: number, repeats: number): Promise<void> {
  const settings = { livePoints: 50, method: 'slice' as const, slice: { steps }, evidence: 'importance' as const };
  const runs: Run[] = [];
  for (let seed = 1; seed <= repeats; seed++) {
    const started = performance.now();
    const result = await runNested(build(), { ...settings, seed });
    runs.push(runOf(result, (performance.now() - started) / 1000));
  }
  report(name, settings, runs, truth, 0);
}

async function demo(repeats: number, threads: number, makeReference: boolean): Promise<void> {
  const config = loadConfig(demoConfigPath);
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-evidence-'));
  try {
    simulateToFolder(config, folder, { seed: runDefaults.demo.noiseSeed, noiseless: false });
    const { columns, rows, pixelScaleArcsec } = config.observation;
    const data = loadObservedData({ folder }, { columns, rows, pixelScaleArcsec });
    if (makeReference) {
      const started = performance.now();
      const { result } = await runModelEvidence(config, data, 1, { ...referenceSettings, threads });
      console.log(JSON.stringify({
        command: 'npm run bench -- evidence --make-reference --threads ' + threads,
        settings: referenceSettings,
        lnZ: result.lnZ,
        lnZError: result.lnZError,
        nestedLnZ: result.nestedLnZ,
        nestedLnZError: result.nestedLnZError,
        evaluations: result.evaluations,
        effectiveSampleSize: result.importance?.final.effectiveSampleSize,
        paretoShape: result.importance?.final.paretoShape,
        suspect: result.importance?.suspect,
        seconds: (performance.now() - started) / 1000,
      }, null, 2));
      return;
    }
    const runs: Run[] = [];
    for (let seed = 1; seed <= repeats; seed++) {
      const started = performance.now();
      const run = await runModelEvidence(config, data, 1, { ...demoEvidenceSettings, seed, threads });
      runs.push(runOf(run.result, (performance.now() - started) / 1000));
      // Each run as it ends on standard error (the demo runs are long), the summary line at the end.
      console.error(JSON.stringify({ scenario: 'demoPerturbed', seed, ...runs[runs.length - 1] }));
    }
    // Read after the runs, so that they can start while the reference is still being made.
    // Without the reference file (not yet made: `--make-reference`) the comparisons are null.
    const reference = existsSync(referencePath)
      ? JSON.parse(readFileSync(referencePath, 'utf8')) as { lnZ: number; lnZError: number; settings: EvidenceSettings }
      : { lnZ: Number.NaN, lnZError: Number.NaN };
    report('demoPerturbed', demoEvidenceSettings, runs, reference.lnZ, reference.lnZError);
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}

export async function run(args: string[]): Promise<void> {
  const repeats = wholeNumberOption(args, '--repeats', 8, 2);
  const demoRepeats = wholeNumberOption(args, '--demo-repeats', 4, 2);
  const threads = wholeNumberOption(args, '--threads', 1);
  const only = benchOption(args, '--only');
  if (args.includes('--make-reference')) {
    await demo(0, threads, true);
    return;
  }
  if (only === undefined || only === 'shells') await analytic('gaussianShells20', () => gaussianShellsProblem(20), gaussianShellsLnEvidence(20), 20, repeats);
  if (only === undefined || only === 'twisted') await analytic('twistedGaussian10', () => twistedGaussianProblem(10), twistedGaussianLnEvidence(10), 10, repeats);
  if (only === undefined || only === 'demo') await demo(demoRepeats, threads, false);
}
