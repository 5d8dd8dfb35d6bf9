import { spawn } from 'node:child_process';
import { appendFileSync, closeSync, existsSync, mkdirSync, openSync } from 'node:fs';
import { hostname } from 'node:os';
import { dirname, join } from 'node:path';
import { EXIT_STATUS } from '../errors.js';
import { batchJobs } from './batchJobs.js';
import { batchLayout } from './batchLayout.js';
import { readJobResult } from './batchStatus.js';
import type { BatchPlan } from './batchPlan.js';
import type { BatchRow } from './batchRow.js';
import { processUsage } from './processUsage.js';
import { rowCommand } from './rowCommand.js';
import { acquireRowLock } from './rowLock.js';
import { givenUp, readRowState, writeRowState, type RowAttempt } from './rowState.js';

/** How a runner's turn at a row ended. */
export type RowRunOutcome =
  | 'finished'          // this turn ran the row to its summary file
  | 'already-finished'  // its summary file was there: nothing to do
  | 'failed'            // failed maxAttempts times, or on a user mistake: left failed
  | 'busy'              // another live runner holds the row
  | 'interrupted';      // this runner was asked to stop (a signal): the row keeps its checkpoints

export interface RowRunSettings {
  readonly out: string;
  readonly plan: BatchPlan;
  /** Threads of the row's command. */
  readonly threads: number;
  readonly maxAttempts: number;
  readonly heartbeatSeconds: number;
  readonly staleSeconds: number;
  /** node and dist/cli/main.js. */
  readonly nodePath: string;
  readonly cliPath: string;
  /** `JOBID_TASK` of the Slurm task running the row, or null. */
  readonly slurmTask: string | null;
  /** Stops the row's command (SIGTERM) and ends the turn as 'interrupted'. */
  readonly signal?: AbortSignal;
  /** Called when an attempt starts (after the lock is taken). */
  readonly onAttemptStart?: (row: BatchRow, attempt: RowAttempt) => void;
}

/** True when the row's job has written its last file. */
export function rowFinished(out: string, row: BatchRow): boolean {
  return existsSync(join(batchLayout.rowFolder(out, row.id), batchJobs[row.job].summaryFile));
}

/** The message of a failed command: its last `arcsift: ...` line on standard error, else its last line. */
function failureMessage(stderrTail: string, code: number | null, signal: string | null): string {
  const lines = stderrTail.split('\n').map((l) => l.trim()).filter((l) => l !== '');
  const own = lines.filter((l) => l.startsWith('arcsift: '));
  if (own.length > 0) return own[own.length - 1].slice('arcsift: '.length);
  if (lines.length > 0) return lines[lines.length - 1];
  return signal !== null ? `killed by ${signal}` : `exit status ${code}`;
}

/** One run of the row's command, its attempt recorded in state/ID.json from start to end. */
function attemptRow(settings: RowRunSettings, row: BatchRow, touchLock: () => void): Promise<RowAttempt> {
  const { out, plan } = settings;
  const state = readRowState(out, row.id);
  const folder = batchLayout.rowFolder(out, row.id);
  const attempt: RowAttempt = {
    startedAt: new Date().toISOString(), endedAt: null, outcome: null, resumed: existsSync(folder),
    exitCode: null, signal: null, message: null, seconds: 0, cpuSeconds: null, peakMemoryMb: null,
    host: hostname(), pid: process.pid, slurmTask: settings.slurmTask, threads: settings.threads,
  };
  state.attempts.push(attempt);
  writeRowState(out, state);
  settings.onAttemptStart?.(row, attempt);
  const logFile = batchLayout.logFile(out, row.id);
  mkdirSync(dirname(logFile), { recursive: true });
  const log = openSync(logFile, 'a');
  const started = performance.now();
  const child = spawn(settings.nodePath, [settings.cliPath, ...rowCommand(out, plan, row, settings.threads)], { stdio: ['ignore', log, 'pipe'] });
  closeSync(log);
  let stderrTail = '';
  child.stderr?.on('data', (chunk: Buffer) => {
    appendFileSync(logFile, chunk);
    stderrTail = (stderrTail + chunk.toString('utf8')).slice(-8192);
  });
  let stopping = false;
  const stop = (): void => {
    stopping = true;
    child.kill('SIGTERM');
  };
  if (settings.signal?.aborted === true) stop();
  settings.signal?.addEventListener('abort', stop);
  // Sampled every second: the last sample misses at most the final second of CPU time.
  const measure = (): void => {
    const usage = child.pid === undefined ? null : processUsage(child.pid);
    if (usage === null) return;
    attempt.peakMemoryMb = Math.max(attempt.peakMemoryMb ?? 0, usage.peakMemoryMb);
    attempt.cpuSeconds = Math.max(attempt.cpuSeconds ?? 0, usage.cpuSeconds);
  };
  const sampler = setInterval(measure, 1000);
  const heartbeat = setInterval(() => {
    touchLock();
    attempt.seconds = (performance.now() - started) / 1000;
    writeRowState(out, state);
  }, settings.heartbeatSeconds * 1000);
  return new Promise((resolve) => {
    child.on('close', (code, signal) => {
      clearInterval(sampler);
      clearInterval(heartbeat);
      settings.signal?.removeEventListener('abort', stop);
      attempt.seconds = (performance.now() - started) / 1000;
      attempt.endedAt = new Date().toISOString();
      attempt.exitCode = code;
      attempt.signal = signal;
      // A signal the command received itself (the scheduler's SIGTERM reaches the whole job) ends
      // it with a last checkpoint and status 4: an interruption, resumed on the next turn. A run a
      // limit of the row's options cut short (status 3) wrote its summary: the row is done.
      if (stopping || code === EXIT_STATUS.interrupted) {
        attempt.outcome = 'interrupted';
      } else if ((code === EXIT_STATUS.finished || code === EXIT_STATUS.unfinished) && rowFinished(out, row)) {
        attempt.outcome = 'finished';
        if (code === EXIT_STATUS.unfinished) attempt.message = 'cut short by a limit of its options: its summary says finished: false';
        attempt.result = readJobResult(join(batchLayout.rowFolder(out, row.id), batchJobs[row.job].summaryFile), row.job).result;
      } else {
        attempt.outcome = 'failed';
        attempt.message = code === 0
          ? `${batchJobs[row.job].command} exited without writing ${batchJobs[row.job].summaryFile}`
          : failureMessage(stderrTail, code, signal);
      }
      writeRowState(out, state);
      resolve(attempt);
    });
    child.on('error', (error) => {
      stderrTail += `\narcsift: could not start ${settings.nodePath}: ${error.message}`;
    });
    measure();
  });
}

/**
 * One runner's turn at a row: nothing when its job's summary file is there, when it has failed
 * for good (maxAttempts failures, or a user mistake) or when another live runner holds it;
 * otherwise it takes the row's lock and runs the job's command, resuming from the checkpoints of
 * an earlier attempt, and runs it again after a failure until it finishes or has failed
 * maxAttempts times. A runner killed outright leaves an attempt without an end and a lock that
 * goes stale; the next turn resumes the row, and that attempt does not count as a failure.
 */
export async function runBatchRow(settings: RowRunSettings, row: BatchRow): Promise<RowRunOutcome> {
  const { out } = settings;
  if (rowFinished(out, row)) return 'already-finished';
  if (givenUp(readRowState(out, row.id), settings.maxAttempts)) return 'failed';
  const lock = acquireRowLock(out, row.id, settings.staleSeconds, settings.slurmTask === null ? 'batch' : `Slurm task ${settings.slurmTask}`);
  if (lock === null) return 'busy';
  try {
    for (;;) {
      if (rowFinished(out, row)) return 'already-finished';
      const attempt = await attemptRow(settings, row, () => lock.touch());
      if (attempt.outcome === 'finished') return 'finished';
      if (attempt.outcome === 'interrupted') return 'interrupted';
      if (givenUp(readRowState(out, row.id), settings.maxAttempts)) return 'failed';
    }
  } finally {
    lock.release();
  }
}
