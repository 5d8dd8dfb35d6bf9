import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runDefaults } from '../settings/runDefaults.js';
import { batchJobs } from './batchJobs.js';
import type { BatchJobResult } from './batchJob.js';
import { batchLayout } from './batchLayout.js';
import { readBatchPlan } from './batchPlan.js';
import { rowLocked } from './rowLock.js';
import { failureCount, givenUp, lastFailure, readRowState, rowCpuSeconds, rowSeconds } from './rowState.js';

/**
 * Where a row stands: finished (its summary file is there); running (a live runner holds its
 * lock); failed (given up: maxAttempts failures, or a user mistake); queued (its Slurm task waits
 * in the queue, when the caller asked squeue); retrying (failed, attempts left: the next run of
 * the batch tries again); interrupted (started, not finished: the next run resumes it from its
 * checkpoints); waiting (never started).
 */
export type RowState = 'finished' | 'running' | 'failed' | 'queued' | 'retrying' | 'interrupted' | 'waiting';
export const ROW_STATES: readonly RowState[] = ['finished', 'running', 'failed', 'queued', 'retrying', 'interrupted', 'waiting'];

/** One row of the status table (and of the merged results). */
export interface BatchStatusRow {
  readonly id: string;
  readonly job: string;
  readonly state: RowState;
  readonly attempts: number;
  readonly failures: number;
  /** Wall-clock seconds over all attempts. */
  readonly seconds: number;
  /** CPU seconds over all attempts (null where not measured). */
  readonly cpuSeconds: number | null;
  /** Threads of the last attempt. */
  readonly threads: number | null;
  readonly peakMemoryMb: number | null;
  readonly result: BatchJobResult | null;
  /** The last failure's message (also for a row that finished after a retry). */
  readonly error: string | null;
  readonly folder: string;
}

/** The measured cost of one kind of job over the batch's finished rows. */
export interface JobCost {
  readonly job: string;
  readonly finishedRows: number;
  readonly meanSeconds: number;
  readonly maxSeconds: number;
  /** Mean CPU seconds of a row (the core-seconds it takes), over the rows where it was measured; else seconds x threads. */
  readonly meanCoreSeconds: number;
  readonly peakMemoryMb: number | null;
}

export interface BatchStatus {
  readonly out: string;
  readonly rows: readonly BatchStatusRow[];
  readonly counts: Readonly<Record<RowState, number>>;
  readonly costs: readonly JobCost[];
}

/** The result of a finished row from its summary file (the job's own reading of it). */
export function readJobResult(file: string, job: string): { result: BatchJobResult | null; error: string | null } {
  try {
    return { result: batchJobs[job].result(JSON.parse(readFileSync(file, 'utf8'))), error: null };
  } catch (error) {
    return { result: null, error: `cannot read ${file}: ${(error as Error).message}` };
  }
}

/** The measured costs per job kind of the finished rows. */
export function jobCosts(rows: readonly BatchStatusRow[]): JobCost[] {
  const kinds = [...new Set(rows.map((r) => r.job))];
  return kinds.flatMap((job) => {
    const done = rows.filter((r) => r.job === job && r.state === 'finished' && r.seconds > 0);
    if (done.length === 0) return [];
    const memory = done.map((r) => r.peakMemoryMb).filter((m): m is number => m !== null);
    return [{
      job,
      finishedRows: done.length,
      meanSeconds: done.reduce((s, r) => s + r.seconds, 0) / done.length,
      maxSeconds: Math.max(...done.map((r) => r.seconds)),
      meanCoreSeconds: done.reduce((s, r) => s + (r.cpuSeconds ?? r.seconds * (r.threads ?? 1)), 0) / done.length,
      peakMemoryMb: memory.length === 0 ? null : Math.max(...memory),
    }];
  });
}

/** The state of every row of a batch folder, read from its files; rows in `queued` (from squeue, see slurmQueue.ts) read as queued. */
export function batchStatus(out: string, options: { maxAttempts?: number; staleSeconds?: number; queued?: ReadonlySet<string> } = {}): BatchStatus {
  const plan = readBatchPlan(out);
  const maxAttempts = options.maxAttempts ?? runDefaults.batch.maxAttempts;
  const staleSeconds = options.staleSeconds ?? runDefaults.batch.staleSeconds;
  const rows = plan.rows.map((row): BatchStatusRow => {
    const state = readRowState(out, row.id);
    const folder = batchLayout.rowFolder(out, row.id);
    const summary = join(folder, batchJobs[row.job].summaryFile);
    const last = state.attempts[state.attempts.length - 1];
    let rowState: RowState;
    let read: { result: BatchJobResult | null; error: string | null } = { result: null, error: lastFailure(state) };
    if (existsSync(summary)) {
      rowState = 'finished';
      // The result kept in the state at the end of the row, else read from the summary (a batch of
      // 10^5 rows would otherwise read 10^5 summaries for every status).
      const kept = last?.outcome === 'finished' ? last.result : undefined;
      const parsed = kept !== undefined && kept !== null ? { result: kept, error: null } : readJobResult(summary, row.job);
      read = { result: parsed.result, error: parsed.error ?? read.error };
    } else if (rowLocked(out, row.id, staleSeconds)) {
      rowState = 'running';
    } else if (givenUp(state, maxAttempts)) {
      rowState = 'failed';
    } else if (options.queued?.has(row.id) === true) {
      rowState = 'queued';
    } else if (last?.outcome === 'failed') {
      rowState = 'retrying';
    } else {
      rowState = state.attempts.length === 0 ? 'waiting' : 'interrupted';
    }
    const memory = state.attempts.map((a) => a.peakMemoryMb).filter((m): m is number => m !== null);
    return {
      id: row.id, job: row.job, state: rowState, attempts: state.attempts.length, failures: failureCount(state),
      seconds: rowSeconds(state), cpuSeconds: rowCpuSeconds(state), threads: last?.threads ?? null, peakMemoryMb: memory.length === 0 ? null : Math.max(...memory),
      result: read.result, error: read.error, folder,
    };
  });
  const counts = Object.fromEntries(ROW_STATES.map((s) => [s, rows.filter((r) => r.state === s).length])) as Record<RowState, number>;
  return { out, rows, counts, costs: jobCosts(rows) };
}
