import { runDefaults } from '../settings/runDefaults.js';
import type { BatchPlan } from './batchPlan.js';
import type { BatchRow } from './batchRow.js';
import { batchStatus } from './batchStatus.js';
import { runBatchRow, type RowRunOutcome, type RowRunSettings } from './runBatchRow.js';

/** Progress of a local batch, as its printer shows it. */
export interface BatchProgress {
  readonly total: number;
  /** Finished rows, earlier runs' included. */
  readonly done: number;
  readonly running: number;
  /** Rows left failed (out of attempts, or a user mistake). */
  readonly failed: number;
  /** Rows this run has still to start (held by another runner: not counted here). */
  readonly waiting: number;
  /** Rows another live runner holds. */
  readonly busy: number;
  readonly elapsedSeconds: number;
  /** Estimated from the measured seconds per row of each job (null before any row has finished). */
  readonly remainingSeconds: number | null;
}

export interface LocalBatchSettings extends Omit<RowRunSettings, 'slurmTask' | 'onAttemptStart'> {
  /** Rows run at the same time. */
  readonly parallel: number;
  readonly onProgress?: (progress: BatchProgress) => void;
  readonly progressSeconds?: number;
}

/**
 * Runs a batch's unfinished rows on this machine, `parallel` at a time (each with `threads`
 * threads), and returns each row's outcome by id. Rows finished or given up are not run again;
 * interrupted ones resume; failed ones are retried up to maxAttempts (runBatchRow).
 */
export async function runBatchLocally(settings: LocalBatchSettings): Promise<Map<string, RowRunOutcome>> {
  const { out, plan } = settings;
  const before = batchStatus(out, { maxAttempts: settings.maxAttempts, staleSeconds: settings.staleSeconds });
  const outcomes = new Map<string, RowRunOutcome>();
  const queue: BatchRow[] = [];
  for (const row of plan.rows) {
    const state = before.rows.find((r) => r.id === row.id)?.state;
    if (state === 'finished') outcomes.set(row.id, 'already-finished');
    else if (state === 'failed') outcomes.set(row.id, 'failed');
    else queue.push(row);
  }
  const costs = new Map(before.costs.map((c) => [c.job, c.meanSeconds]));
  const finishedHere = new Map<string, number[]>();
  const running = new Map<string, { job: string; started: number }>();
  const started = performance.now();
  const total = plan.rows.length;
  const meanSeconds = (job: string): number | undefined => {
    const here = finishedHere.get(job);
    if (here !== undefined && here.length > 0) return here.reduce((a, b) => a + b, 0) / here.length;
    return costs.get(job);
  };
  const progress = (): BatchProgress => {
    const values = [...outcomes.values()];
    const now = performance.now();
    let work = 0;
    let known = true;
    for (const row of queue) {
      const m = meanSeconds(row.job);
      if (m === undefined) known = false;
      else work += m;
    }
    for (const r of running.values()) {
      const m = meanSeconds(r.job);
      if (m === undefined) known = false;
      else work += Math.max(0, m - (now - r.started) / 1000);
    }
    return {
      total,
      done: values.filter((o) => o === 'finished' || o === 'already-finished').length,
      running: running.size,
      failed: values.filter((o) => o === 'failed').length,
      waiting: queue.length,
      busy: values.filter((o) => o === 'busy').length,
      elapsedSeconds: (now - started) / 1000,
      remainingSeconds: known ? work / Math.max(1, Math.min(settings.parallel, running.size + queue.length)) : null,
    };
  };
  const report = (): void => settings.onProgress?.(progress());
  const ticker = setInterval(report, (settings.progressSeconds ?? runDefaults.batch.progressSeconds) * 1000);
  const worker = async (): Promise<void> => {
    for (let row = queue.shift(); row !== undefined; row = queue.shift()) {
      if (settings.signal?.aborted === true) {
        outcomes.set(row.id, 'interrupted');
        continue;
      }
      const rowStarted = performance.now();
      running.set(row.id, { job: row.job, started: rowStarted });
      report();
      const outcome = await runBatchRow({ ...settings, slurmTask: null }, row);
      running.delete(row.id);
      outcomes.set(row.id, outcome);
      if (outcome === 'finished') finishedHere.set(row.job, [...(finishedHere.get(row.job) ?? []), (performance.now() - rowStarted) / 1000]);
      report();
    }
  };
  try {
    report();
    await Promise.all(Array.from({ length: Math.max(1, settings.parallel) }, worker));
  } finally {
    clearInterval(ticker);
  }
  return outcomes;
}
