import type { Argv, CommandModule } from 'yargs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { runBatch } from '../batch/runBatch.js';
import { batchStatus } from '../batch/batchStatus.js';
import { mergeBatchResults } from '../batch/mergeBatchResults.js';
import { runBatchTask } from '../batch/runBatchTask.js';
import { queuedRows } from '../batch/slurmQueue.js';
import { batchLayout } from '../batch/batchLayout.js';
import { arcsiftCliPath } from '../batch/arcsiftCliPath.js';
import { runDefaults } from '../settings/runDefaults.js';
import { wholeNumberOption } from './dataOptions.js';
import { formatBatchProgress, formatBatchStatus } from './formatBatchStatus.js';
import { InputError, expectedFound } from '../errors.js';
import type { SlurmBatchSettings } from '../batch/submitBatchToSlurm.js';
import type { SlurmSubmission } from '../batch/slurmSubmission.js';
import type { BatchProgress } from '../batch/runBatchLocally.js';

/** Options shared by `batch run` and `calibrate`: where and how rows run. */
export interface BatchRunArguments {
  threads: number;
  parallel?: number;
  'max-attempts': number;
  slurm: boolean;
  'rows-per-task': number;
  'minutes-per-row'?: number;
  'memory-per-row'?: number;
  'max-running'?: number;
  'max-array-size': number;
  partition?: string;
  account?: string;
  sbatch?: string[];
  submit: boolean;
  quiet: boolean;
}

export function withBatchRunOptions<T>(y: Argv<T>): Argv<T & BatchRunArguments> {
  return y
    .option('threads', { type: 'number', default: 1, describe: 'threads of each row\'s run (on Slurm: CPUs per task)' })
    .option('parallel', { type: 'number', describe: 'local: rows run at the same time [default: cores / threads]' })
    .option('max-attempts', { type: 'number', default: runDefaults.batch.maxAttempts, describe: 'a row that fails (not one killed from outside) is tried this many times' })
    .option('slurm', { type: 'boolean', default: false, describe: 'submit the unfinished rows as a Slurm job array (sbatch) instead of running them here' })
    .option('rows-per-task', { type: 'number', default: runDefaults.batch.rowsPerTask, describe: 'Slurm: rows run one after the other by one array task' })
    .option('minutes-per-row', { type: 'number', describe: 'Slurm: minutes a row may take [default: measured on the batch\'s finished rows, or on one row run here first]' })
    .option('memory-per-row', { type: 'number', describe: 'Slurm: memory of a task in MB [default: measured peak x 1.5]' })
    .option('max-running', { type: 'number', describe: 'Slurm: at most this many tasks at once (--array=...%N)' })
    .option('max-array-size', { type: 'number', default: 1000, describe: 'Slurm: tasks per job array at most (the cluster\'s MaxArraySize less one); more rows go in further arrays' })
    .option('partition', { type: 'string', describe: 'Slurm partition' })
    .option('account', { type: 'string', describe: 'Slurm account' })
    .option('sbatch', { type: 'string', array: true, describe: 'Slurm: a further sbatch option for the script, e.g. --sbatch=--qos=short (repeatable)' })
    .option('submit', { type: 'boolean', default: true, describe: 'Slurm: call sbatch (--no-submit writes the script only)' })
    .option('quiet', { type: 'boolean', default: false, describe: 'print no progress' }) as Argv<T & BatchRunArguments>;
}

function positive(name: string, value: number | undefined): number | undefined {
  if (value === undefined) return undefined;
  if (!(value > 0) || !Number.isFinite(value)) throw new InputError(`--${name}: ${expectedFound('a number > 0', value)}`);
  return value;
}

/**
 * The batch settings of the shared options, checked, with a progress printer and a signal that
 * SIGINT or SIGTERM aborts (the rows' commands are then stopped and their rows left interrupted).
 */
export function batchRunSettingsOf(args: BatchRunArguments): {
  threads: number; parallel?: number; maxAttempts: number; slurm?: SlurmBatchSettings; onProgress?: (p: BatchProgress) => void; onNote: (line: string) => void; signal: AbortSignal;
} {
  const threads = wholeNumberOption('threads', args.threads, 1);
  const controller = new AbortController();
  for (const signal of ['SIGINT', 'SIGTERM'] as const) process.once(signal, () => controller.abort());
  const terminal = process.stderr.isTTY === true;
  let last = '';
  return {
    threads,
    parallel: args.parallel === undefined ? undefined : wholeNumberOption('parallel', args.parallel, 1),
    maxAttempts: wholeNumberOption('max-attempts', args['max-attempts'], 1),
    slurm: !args.slurm ? undefined : {
      rowsPerTask: wholeNumberOption('rows-per-task', args['rows-per-task'], 1),
      minutesPerRow: positive('minutes-per-row', args['minutes-per-row']),
      memoryPerRowMb: positive('memory-per-row', args['memory-per-row']),
      maxRunning: args['max-running'] === undefined ? undefined : wholeNumberOption('max-running', args['max-running'], 1),
      maxArraySize: wholeNumberOption('max-array-size', args['max-array-size'], 1),
      partition: args.partition,
      account: args.account,
      sbatchOptions: args.sbatch ?? [],
      noSubmit: !args.submit,
    },
    onProgress: args.quiet ? undefined : (p) => {
      const line = formatBatchProgress(p);
      if (line === last) return;
      last = line;
      process.stderr.write(terminal ? `\r\x1b[2K${line}` : `${line}\n`);
    },
    onNote: (line) => { if (!args.quiet) process.stderr.write(`${terminal && last !== '' ? '\n' : ''}${line}\n`); },
    signal: controller.signal,
  };
}

/** The arguments after a bare `--`: options for every row's command. */
export function trailingJobOptions(): string[] {
  const at = process.argv.indexOf('--');
  return at < 0 ? [] : process.argv.slice(at + 1);
}

/** One line on a submission: its job id (or the script to submit), tasks, rows and resources. */
export function formatSubmission(s: SlurmSubmission): string {
  const what = `${s.groups.length} task(s) for ${s.groups.flat().length} row(s), ${s.resources.cpusPerTask} CPU, ${s.resources.memoryMb} MB, ${s.resources.timeMinutes} min each (${s.resources.basis})`;
  return s.jobId === null ? `wrote ${s.script}: ${what}; submit it with: sbatch ${s.script}` : `submitted job array ${s.jobId}: ${what}; script ${s.script}`;
}

interface RunArguments extends BatchRunArguments {
  manifest: string;
  out: string;
  'job-options'?: string;
  reports: boolean;
}

const runCommand: CommandModule<object, RunArguments> = {
  command: 'run <manifest>',
  describe: 'Run every row of a manifest here, or submit them to Slurm; again to resume',
  builder: (y) => withBatchRunOptions(y
    .usage('$0 batch run MANIFEST --out DIR [options] [-- OPTIONS OF EVERY ROW\'S COMMAND]\n\n' +
      'MANIFEST is CSV (header id,job,config,data,image,noise,psf,mask,flags,seed,options) or YAML (rows: [...], defaults: {...}); ' +
      'job is fit, compare, vet, sensitivity or verdict. Each row runs `arcsift JOB` into DIR/rows/ID. Running the same command again skips ' +
      'finished rows, resumes interrupted ones from their checkpoints and retries failed ones.')
    .positional('manifest', { type: 'string', demandOption: true, describe: 'the manifest (.csv, .yaml or .json)' })
    .option('out', { type: 'string', demandOption: true, describe: 'batch folder' })
    .option('job-options', { type: 'string', describe: 'options of every row\'s command as one string, e.g. "--live-points 50" (or give them after --)' })
    .option('reports', { type: 'boolean', default: false, describe: 'write each row\'s report.html' }))
    .example('$0 batch run lenses.csv --out chains/survey -- --live-points 100', 'run here, two rows at a time on two cores')
    .example('$0 batch run lenses.csv --out chains/survey --slurm --rows-per-task 4 -- --live-points 100', 'submit as a Slurm job array'),
  handler: async (args) => {
    const run = batchRunSettingsOf(args);
    const runOptions = [...(args['job-options']?.trim().split(/\s+/).filter((t) => t !== '') ?? []), ...trailingJobOptions()];
    const outcome = await runBatch({ manifest: args.manifest, out: args.out, runOptions, reports: args.reports, ...run });
    if (run.onProgress !== undefined && process.stderr.isTTY === true) process.stderr.write('\n');
    if (outcome.mode === 'slurm') {
      if (outcome.submissions.length === 0) {
        process.stdout.write(`nothing to submit: every row is finished, running or given up\n\n${formatBatchStatus(outcome.status)}\n`);
        return;
      }
      for (const s of outcome.submissions) process.stdout.write(`${formatSubmission(s)}\n`);
      process.stdout.write(`follow with: arcsift batch status ${args.out}\n`);
      return;
    }
    const status = mergeBatchResults(args.out, { maxAttempts: run.maxAttempts });
    process.stdout.write(`${formatBatchStatus(status)}\n\nwrote ${batchLayout.resultsCsv(args.out)} and ${batchLayout.resultsJson(args.out)}\n`);
    if (run.signal.aborted) process.exitCode = 130;
    else if (status.counts.failed + status.counts.retrying > 0) process.exitCode = 1;
  },
};

interface FolderArguments {
  folder: string;
  'max-attempts': number;
}

const statusCommand: CommandModule<object, FolderArguments> = {
  command: 'status <folder>',
  describe: 'The state of every row of a batch: finished, running, failed, queued (squeue asked), retrying, interrupted or waiting',
  builder: (y) => y
    .positional('folder', { type: 'string', demandOption: true, describe: 'batch folder' })
    .option('max-attempts', { type: 'number', default: runDefaults.batch.maxAttempts, describe: 'as given to batch run: a row failed this often is given up' }),
  handler: (args) => {
    process.stdout.write(`${formatBatchStatus(batchStatus(args.folder, { maxAttempts: args['max-attempts'], queued: queuedRows(args.folder) }))}\n`);
  },
};

const mergeCommand: CommandModule<object, FolderArguments> = {
  command: 'merge <folder>',
  describe: 'Merge the rows of a batch into results.csv and results.json; list the failed rows',
  builder: (y) => y
    .positional('folder', { type: 'string', demandOption: true, describe: 'batch folder' })
    .option('max-attempts', { type: 'number', default: runDefaults.batch.maxAttempts, describe: 'as given to batch run' }),
  handler: (args) => {
    const status = mergeBatchResults(args.folder, { maxAttempts: args['max-attempts'] });
    const failed = status.rows.filter((r) => r.state === 'failed' || r.state === 'retrying');
    const lines = [`merged ${status.counts.finished} finished row(s) of ${status.rows.length} into ${batchLayout.resultsCsv(args.folder)} and ${batchLayout.resultsJson(args.folder)}`];
    if (failed.length > 0) lines.push('', 'failed rows:', ...failed.map((r) => `  ${r.id} (${r.job}, ${r.attempts} attempt(s)): ${r.error ?? 'no message'}`));
    process.stdout.write(`${lines.join('\n')}\n`);
  },
};

interface TaskArguments extends FolderArguments {
  submission: number;
  task: number;
  threads: number;
}

const taskCommand: CommandModule<object, TaskArguments> = {
  command: 'task <folder>',
  describe: 'Run the rows of one task of a Slurm submission (what the job-array script calls)',
  builder: (y) => y
    .positional('folder', { type: 'string', demandOption: true, describe: 'batch folder' })
    .option('submission', { type: 'number', demandOption: true, describe: 'submission number (slurm/submission-N.json)' })
    .option('task', { type: 'number', demandOption: true, describe: 'task index: the group of rows to run' })
    .option('threads', { type: 'number', default: 1, describe: 'threads of each row\'s run' })
    .option('max-attempts', { type: 'number', default: runDefaults.batch.maxAttempts, describe: 'attempts at a failing row' }),
  handler: async (args) => {
    const controller = new AbortController();
    for (const signal of ['SIGINT', 'SIGTERM'] as const) process.once(signal, () => controller.abort());
    const job = process.env.SLURM_ARRAY_JOB_ID;
    const outcomes = await runBatchTask({
      out: args.folder,
      submission: wholeNumberOption('submission', args.submission, 1),
      task: wholeNumberOption('task', args.task, 0),
      threads: wholeNumberOption('threads', args.threads, 1),
      maxAttempts: wholeNumberOption('max-attempts', args['max-attempts'], 1),
      heartbeatSeconds: runDefaults.batch.heartbeatSeconds,
      staleSeconds: runDefaults.batch.staleSeconds,
      nodePath: process.execPath,
      cliPath: arcsiftCliPath(),
      slurmTask: job === undefined ? null : `${job}_${process.env.SLURM_ARRAY_TASK_ID ?? args.task}`,
      signal: controller.signal,
    });
    for (const [id, outcome] of outcomes) process.stdout.write(`${id}: ${outcome} (${join(args.folder, 'rows', id)}) on ${hostname()}\n`);
    const values = [...outcomes.values()];
    if (controller.signal.aborted || values.includes('interrupted')) process.exitCode = 143;
    else if (values.includes('failed')) process.exitCode = 1;
  },
};

export const batchCommand: CommandModule<object, object> = {
  command: 'batch',
  describe: 'Run many lenses from a manifest, here or as a Slurm job array; status and merged results',
  builder: (y) => y.command(runCommand).command(statusCommand).command(mergeCommand).command(taskCommand)
    .demandCommand(1, 'name a batch command: run, status, merge or task'),
  handler: () => undefined,
};
