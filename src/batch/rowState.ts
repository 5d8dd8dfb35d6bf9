import { existsSync, readFileSync } from 'node:fs';
import { InputError } from '../errors.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import type { BatchJobResult } from './batchJob.js';
import { batchLayout } from './batchLayout.js';

/** How one attempt at a row ended; null while it runs (or when its runner was killed). */
export type AttemptOutcome = 'finished' | 'failed' | 'interrupted' | null;

/** One attempt at a row: one run of its job's command. */
export interface RowAttempt {
  readonly startedAt: string;
  endedAt: string | null;
  outcome: AttemptOutcome;
  /** Whether the command was asked to resume from checkpoints (the row folder already held a run). */
  readonly resumed: boolean;
  exitCode: number | null;
  signal: string | null;
  /** The command's error message (its last `arcsift:` line) for a failure; a note for a row finished but cut short. */
  message: string | null;
  /** Wall-clock seconds of the attempt, updated at every heartbeat. */
  seconds: number;
  /** CPU seconds of the command (all its threads), sampled every second; null where not measured. */
  cpuSeconds: number | null;
  /** Largest resident memory of the command's process seen (VmHWM), MB; null where not measured. */
  peakMemoryMb: number | null;
  readonly host: string;
  readonly pid: number;
  /** `JOBID_TASK` when run by a Slurm array task. */
  readonly slurmTask: string | null;
  readonly threads: number;
  /** The row's result, read from its summary when the attempt finished it. */
  result?: BatchJobResult | null;
}

/** state/ID.json: every attempt at one row. */
export interface RowStateRecord {
  readonly id: string;
  readonly attempts: RowAttempt[];
}

export function readRowState(out: string, id: string): RowStateRecord {
  const file = batchLayout.stateFile(out, id);
  if (!existsSync(file)) return { id, attempts: [] };
  try {
    return JSON.parse(readFileSync(file, 'utf8')) as RowStateRecord;
  } catch (error) {
    throw new InputError(`not valid JSON: ${(error as Error).message}`, { file });
  }
}

export function writeRowState(out: string, state: RowStateRecord): void {
  writeJsonAtomic(batchLayout.stateFile(out, state.id), state);
}

/** Attempts that failed on their own (not killed from outside). */
export function failureCount(state: RowStateRecord): number {
  return state.attempts.filter((a) => a.outcome === 'failed').length;
}

/**
 * True when retrying cannot help: the last attempt failed on a user mistake (the command's exit
 * status 2: a bad config key, a missing file), or `maxAttempts` attempts have failed.
 */
export function givenUp(state: RowStateRecord, maxAttempts: number): boolean {
  const last = state.attempts[state.attempts.length - 1];
  return (last?.outcome === 'failed' && last.exitCode === 2) || failureCount(state) >= maxAttempts;
}

/** Seconds spent on the row over all attempts. */
export function rowSeconds(state: RowStateRecord): number {
  return state.attempts.reduce((sum, a) => sum + a.seconds, 0);
}

/** CPU seconds spent on the row over all attempts, or null when no attempt was measured. */
export function rowCpuSeconds(state: RowStateRecord): number | null {
  const measured = state.attempts.filter((a) => typeof a.cpuSeconds === 'number');
  return measured.length === 0 ? null : measured.reduce((sum, a) => sum + (a.cpuSeconds as number), 0);
}

/** The last failure's message, or null. */
export function lastFailure(state: RowStateRecord): string | null {
  for (let k = state.attempts.length - 1; k >= 0; k--) {
    const a = state.attempts[k];
    if (a.outcome === 'failed') return a.message ?? (a.signal !== null ? `killed by ${a.signal}` : `exit status ${a.exitCode}`);
  }
  return null;
}
