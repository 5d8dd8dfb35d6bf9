import type { Argv } from 'yargs';
import { InputError } from '../errors.js';
import { defaultThreadCount } from '../parallel/workerPool.js';
import type { EvidenceSettings } from '../inference/runModelEvidence.js';
import type { EvidenceMethod, NestedMethod } from '../sampling/nested/index.js';
import { wholeNumberOption } from './dataOptions.js';
import { progressPrinter } from './progressPrinter.js';
import { runDefaults } from '../settings/runDefaults.js';
import { defaultImportanceSettings } from '../sampling/importance/importanceSettings.js';
import { stopOnSignals } from './stopOnSignals.js';
import { hideBin } from 'yargs/helpers';
import { openRunFolder, type RunFolderOptions } from '../inference/openRunFolder.js';
import { commandLine } from './resumeCommandLine.js';

export interface SamplerArguments {
  threads?: number;
  seed: number;
  'live-points': number;
  method: string;
  'slice-steps': number;
  tolerance: number;
  'max-evaluations'?: number;
  resume: boolean;
  'checkpoint-seconds': number;
  evidence: string;
  'importance-draws': number;
  'importance-error': number;
  'take-over-lock': boolean;
  quiet: boolean;
}

/** Options shared by every command that runs nested sampling. */
export function withSamplerOptions<T>(y: Argv<T>, defaults: { livePoints: number; sliceStepsPerParameter?: number }): Argv<T & SamplerArguments> {
  return y
    .option('threads', { type: 'number', describe: 'worker threads evaluating the likelihood [default: all cores]' })
    .option('seed', { type: 'number', default: runDefaults.nested.seed, describe: 'seed of the sampler (results do not depend on --threads)' })
    .option('live-points', { type: 'number', default: defaults.livePoints, describe: 'live points of each nested-sampling run' })
    .option('method', { choices: ['auto', 'ellipsoids', 'slice'], default: runDefaults.nested.method, describe: 'constrained draws: multi-ellipsoid bounds, slice sampling, or auto (ellipsoids for smooth models of <= 8 free parameters with >= 10 live points per parameter, slice otherwise)' })
    .option('slice-steps', { type: 'number', default: defaults.sliceStepsPerParameter ?? runDefaults.nested.sliceStepsPerParameter, describe: 'slice moves per new live point, per free parameter' })
    .option('tolerance', { type: 'number', default: runDefaults.nested.lnZTolerance, describe: 'stop when the live points could add less than this to ln Z' })
    .option('evidence', { choices: ['nested', 'importance'], default: runDefaults.nested.evidence, describe: 'ln Z from the nested-sampling sum, or from importance sampling after the nested run (fewer evaluations for a small error: see README)' })
    .option('importance-draws', { type: 'number', default: defaultImportanceSettings.drawsPerStage, describe: 'importance sampling: draws of each stage that adapts the proposal (at least 2 such stages; fewer draws cost less for an expensive likelihood, e.g. a pixelated source)' })
    .option('importance-error', { type: 'number', default: defaultImportanceSettings.targetLnZError, describe: `importance sampling: the ln Z error the final stage draws enough for (at least --importance-draws draws, at most ${defaultImportanceSettings.maxFinalDraws})` })
    .option('max-evaluations', { type: 'number', describe: 'stop each run after this many likelihood evaluations' })
    .option('checkpoint-seconds', { type: 'number', default: runDefaults.nested.checkpointSeconds, describe: 'seconds between checkpoints of the sampler state (every sampler; SIGTERM or SIGINT also writes one and stops)' })
    .option('resume', { type: 'boolean', default: false, describe: 'continue an interrupted run from its checkpoints in --out' })
    .option('take-over-lock', { type: 'boolean', default: false, describe: 'take --out over from a run on another host whose lock is still there (only when that run no longer runs)' })
    .option('quiet', { type: 'boolean', default: false, describe: 'print no progress' }) as Argv<T & SamplerArguments>;
}

function positiveOption(name: string, value: number): number {
  if (!(value > 0) || !Number.isFinite(value)) throw new InputError(`--${name}: expected a number > 0, found ${value}`);
  return value;
}

/** The importance stage's draws per adaptation stage and target ln Z error, checked. */
function importanceOptionsOf(args: SamplerArguments): { drawsPerStage: number; targetLnZError: number } {
  const drawsPerStage = wholeNumberOption('importance-draws', args['importance-draws'], 10);
  const most = defaultImportanceSettings.maxFinalDraws;
  if (drawsPerStage > most) throw new InputError(`--importance-draws: expected a whole number <= ${most} (the final stage's most draws), found ${drawsPerStage}`);
  return { drawsPerStage, targetLnZError: positiveOption('importance-error', args['importance-error']) };
}

/**
 * Runs `run` holding the command's output folder (lock, writability, what it holds:
 * openRunFolder, with the command line and notices on standard error), released at the end
 * whatever the outcome.
 */
export async function inOutputFolder(
  out: string, args: SamplerArguments, checkpointFolders: RunFolderOptions['checkpointFolders'], summaryName: string | undefined,
  run: () => Promise<void>,
): Promise<void> {
  const lock = openRunFolder(out, {
    resume: args.resume, checkpointFolders, summaryName, command: commandLine(hideBin(process.argv)), takeOverLock: args['take-over-lock'],
    onNotice: (text) => process.stderr.write(`arcsift: notice: ${text}\n`),
  });
  try {
    await run();
  } finally {
    lock.release();
  }
}

/** Evidence settings from the options, with a progress printer and the command's stop request (SIGTERM, SIGINT); checks the options first. */
export function evidenceSettingsOf(args: SamplerArguments, label: string, options: { plainLines?: boolean } = {}): { settings: EvidenceSettings; finish: () => void } {
  const threads = args.threads === undefined ? defaultThreadCount() : wholeNumberOption('threads', args.threads, 1);
  const seed = wholeNumberOption('seed', args.seed, 1);
  const livePoints = wholeNumberOption('live-points', args['live-points'], 10);
  if (!(args.tolerance > 0)) throw new InputError(`--tolerance: expected a number > 0, found ${args.tolerance}`);
  const maxEvaluations = args['max-evaluations'] === undefined ? undefined : wholeNumberOption('max-evaluations', args['max-evaluations'], 1);
  const printer = progressPrinter(label, { quiet: args.quiet, tolerance: args.tolerance, plainLines: options.plainLines });
  return {
    settings: {
      livePoints, seed, threads, maxEvaluations,
      method: args.method as NestedMethod,
      sliceStepsPerParameter: positiveOption('slice-steps', args['slice-steps']),
      replacementsPerStep: runDefaults.nested.replacementsPerStep,
      lnZTolerance: args.tolerance,
      evidence: args.evidence as EvidenceMethod,
      importance: importanceOptionsOf(args),
      resume: args.resume,
      checkpointSeconds: positiveOption('checkpoint-seconds', args['checkpoint-seconds']),
      onProgress: printer.onProgress,
      signal: stopOnSignals(),
    },
    finish: printer.finish,
  };
}

