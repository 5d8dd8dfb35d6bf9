import { execFile } from 'node:child_process';
import { basename, resolve } from 'node:path';
import { InputError } from '../errors.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import { runDefaults } from '../settings/runDefaults.js';
import { batchLayout } from './batchLayout.js';
import type { JobCost } from './batchStatus.js';
import { slurmJobScript } from './slurmJobScript.js';
import { submissionNumbers, type SlurmResources, type SlurmSubmission } from './slurmSubmission.js';

/** How a batch goes to Slurm: the grouping of rows and each task's resources (or how to measure them). */
export interface SlurmBatchSettings {
  readonly rowsPerTask: number;
  /** Minutes a row may take; default from the batch's measured cost. */
  readonly minutesPerRow?: number;
  /** Memory (MB) a row may use; default from the batch's measured peak. */
  readonly memoryPerRowMb?: number;
  /** At most this many tasks of the array at once (sbatch --array=...%N). */
  readonly maxRunning?: number;
  /** Tasks per job array at most (Slurm's MaxArraySize, 1001 by default, allows indices 0-1000); more rows go in further arrays. */
  readonly maxArraySize?: number;
  readonly partition?: string;
  readonly account?: string;
  readonly sbatchOptions?: readonly string[];
  /** Write the script and the submission record without calling sbatch. */
  readonly noSubmit?: boolean;
  readonly jobName?: string;
}

/** Memory asked for when nothing was measured (no /proc), MB. */
const UNMEASURED_MEMORY_MB = 2048;

/**
 * Each task's Slurm resources: --time = rows per task x seconds per row x slurmTimeFactor +
 * slurmMarginMinutes, --mem = peak memory x slurmMemoryFactor, from the user's numbers where given,
 * else from the measured cost of the batch's finished rows (the slowest job kind, its slowest row).
 */
export function slurmResources(settings: SlurmBatchSettings, threads: number, costs: readonly JobCost[]): SlurmResources {
  const d = runDefaults.batch;
  const measuredSeconds = costs.length === 0 ? undefined : Math.max(...costs.map((c) => c.maxSeconds));
  const measuredMemory = costs.map((c) => c.peakMemoryMb).filter((m): m is number => m !== null);
  const secondsPerRow = settings.minutesPerRow !== undefined ? settings.minutesPerRow * 60 : measuredSeconds;
  if (secondsPerRow === undefined) throw new InputError('no measured cost per row: run a row first, or give --minutes-per-row');
  const memoryPerRow = settings.memoryPerRowMb ?? (measuredMemory.length > 0 ? Math.max(...measuredMemory) * d.slurmMemoryFactor : UNMEASURED_MEMORY_MB);
  const timeMinutes = Math.ceil((settings.rowsPerTask * secondsPerRow * d.slurmTimeFactor) / 60 + d.slurmMarginMinutes);
  const basis = [
    settings.minutesPerRow !== undefined ? `${settings.minutesPerRow} min per row (given)` : `${secondsPerRow.toFixed(0)} s per row (slowest measured row)`,
    settings.memoryPerRowMb !== undefined ? `${settings.memoryPerRowMb} MB (given)` : measuredMemory.length > 0 ? `${Math.max(...measuredMemory).toFixed(0)} MB peak measured` : `${UNMEASURED_MEMORY_MB} MB (not measured)`,
    `time = ${settings.rowsPerTask} row(s) x ${d.slurmTimeFactor} + ${d.slurmMarginMinutes} min, memory x ${settings.memoryPerRowMb !== undefined ? 1 : d.slurmMemoryFactor}`,
  ].join('; ');
  return {
    cpusPerTask: threads,
    memoryMb: Math.max(256, Math.ceil(memoryPerRow)),
    timeMinutes,
    maxRunning: settings.maxRunning ?? null,
    partition: settings.partition ?? null,
    account: settings.account ?? null,
    extra: settings.sbatchOptions ?? [],
    basis,
  };
}

/** The job id in `sbatch --parsable` output ("123" or "123;cluster"). */
export function parsableJobId(stdout: string): string {
  const match = /^\s*(\d+)(?:;\S*)?\s*$/.exec(stdout);
  if (match === null) throw new Error(`sbatch --parsable printed no job id: ${JSON.stringify(stdout)}`);
  return match[1];
}

function sbatch(script: string): Promise<string> {
  return new Promise((resolveJob, reject) => {
    execFile('sbatch', ['--parsable', script], { encoding: 'utf8', timeout: 60_000 }, (error, stdout, stderr) => {
      if (error === null) {
        resolveJob(parsableJobId(stdout));
        return;
      }
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') {
        reject(new InputError('sbatch not found on PATH: submit from a machine of the Slurm cluster (or run without --slurm)'));
        return;
      }
      reject(new InputError(`sbatch refused the job array ${script}: ${(stderr || error.message).trim()}`));
    });
  });
}

/**
 * Submits the rows `ids` of a batch as one Slurm job array: writes slurm/submission-N.sh (the
 * script, one task per group of rowsPerTask rows, each task running `arcsift batch task`) and
 * slurm/submission-N.json (the groups and resources), calls `sbatch --parsable` unless noSubmit,
 * and records the job id. Returns the submission.
 */
export async function submitBatchToSlurm(
  out: string, ids: readonly string[], settings: SlurmBatchSettings, resources: SlurmResources, taskCommand: readonly string[],
): Promise<SlurmSubmission> {
  const number = (submissionNumbers(out).at(-1) ?? 0) + 1;
  const groups: string[][] = [];
  for (let k = 0; k < ids.length; k += settings.rowsPerTask) groups.push(ids.slice(k, k + settings.rowsPerTask));
  const scriptFile = resolve(batchLayout.scriptFile(out, number));
  const text = slurmJobScript({
    jobName: settings.jobName ?? `arcsift-${basename(resolve(out))}`,
    taskCount: groups.length,
    resources,
    output: resolve(batchLayout.slurmFolder(out), `task-%A_%a.out`),
    command: [...taskCommand, '--submission', String(number), '--task'],
  });
  const written: SlurmSubmission = { submission: number, groups, resources, script: scriptFile, jobId: null, writtenAt: new Date().toISOString() };
  writeFileAtomic(scriptFile, text);
  writeJsonAtomic(batchLayout.submissionFile(out, number), written);
  if (settings.noSubmit === true) return written;
  const jobId = await sbatch(scriptFile);
  const submitted = { ...written, jobId };
  writeJsonAtomic(batchLayout.submissionFile(out, number), submitted);
  return submitted;
}
