import { resolve } from 'node:path';
import { defaultThreadCount } from '../parallel/workerPool.js';
import { runDefaults } from '../settings/runDefaults.js';
import { arcsiftCliPath } from './arcsiftCliPath.js';
import { settleBatchPlan } from './batchPlan.js';
import { batchStatus, type BatchStatus } from './batchStatus.js';
import { checkRunOptions, readBatchManifest } from './readBatchManifest.js';
import { runBatchLocally, type BatchProgress } from './runBatchLocally.js';
import { runBatchRow, type RowRunOutcome } from './runBatchRow.js';
import { slurmResources, submitBatchToSlurm, type SlurmBatchSettings } from './submitBatchToSlurm.js';
import { queuedRows } from './slurmQueue.js';
import type { SlurmSubmission } from './slurmSubmission.js';

/** Slurm's default MaxArraySize is 1001 (array indices 0 to 1000): 1000 tasks per array stays inside it. */
const DEFAULT_MAX_ARRAY_SIZE = 1000;

export interface BatchSettings {
  /** The manifest (CSV or YAML). */
  readonly manifest: string;
  /** The batch folder. */
  readonly out: string;
  /** Options of the job's command for every row, e.g. ['--live-points', '50']. */
  readonly runOptions?: readonly string[];
  /** Write each row's report.html. */
  readonly reports?: boolean;
  /** Threads of each row's command (Slurm: CPUs per task). */
  readonly threads?: number;
  /** Local: rows at once (default: the cores over the threads per row). */
  readonly parallel?: number;
  readonly maxAttempts?: number;
  /** Submit to Slurm instead of running here. */
  readonly slurm?: SlurmBatchSettings;
  readonly signal?: AbortSignal;
  readonly onProgress?: (progress: BatchProgress) => void;
  /** One line of news (a probe row, a submission). */
  readonly onNote?: (line: string) => void;
  /** Defaults: this node and the built dist/cli/main.js. */
  readonly nodePath?: string;
  readonly cliPath?: string;
}

export type BatchOutcome =
  | { readonly mode: 'local'; readonly outcomes: ReadonlyMap<string, RowRunOutcome>; readonly status: BatchStatus }
  | { readonly mode: 'slurm'; readonly submissions: readonly SlurmSubmission[]; readonly status: BatchStatus };

/**
 * Runs a batch manifest into a batch folder: locally, `parallel` rows at a time, or as a Slurm
 * job array of the rows not yet finished, running nor given up. Calling it again with the same
 * manifest and options (a re-submission) keeps finished rows, resumes interrupted ones from
 * their checkpoints and retries failed ones up to maxAttempts. Without --minutes-per-row, the
 * Slurm resources come from the measured cost of the batch's finished rows; when none has
 * finished, one row is run here first to measure it.
 */
export async function runBatch(settings: BatchSettings): Promise<BatchOutcome> {
  const out = resolve(settings.out);
  const rows = readBatchManifest(settings.manifest);
  const runOptions = checkRunOptions(settings.runOptions ?? [], 'the job options');
  const plan = settleBatchPlan(out, settings.manifest, rows, runOptions, settings.reports ?? false);
  const threads = settings.threads ?? 1;
  const maxAttempts = settings.maxAttempts ?? runDefaults.batch.maxAttempts;
  const rowSettings = {
    out, plan, threads, maxAttempts,
    heartbeatSeconds: runDefaults.batch.heartbeatSeconds,
    staleSeconds: runDefaults.batch.staleSeconds,
    nodePath: settings.nodePath ?? process.execPath,
    cliPath: settings.cliPath ?? arcsiftCliPath(),
    signal: settings.signal,
  };
  const statusOptions = { maxAttempts, staleSeconds: rowSettings.staleSeconds };
  if (settings.slurm === undefined) {
    const parallel = settings.parallel ?? Math.max(1, Math.floor(defaultThreadCount() / threads));
    const outcomes = await runBatchLocally({ ...rowSettings, parallel, onProgress: settings.onProgress });
    return { mode: 'local', outcomes, status: batchStatus(out, statusOptions) };
  }
  // Rows whose tasks of an earlier submission still wait in the queue are not submitted again.
  const slurmStatusOptions = { ...statusOptions, queued: queuedRows(out) };
  let status = batchStatus(out, slurmStatusOptions);
  const todo = (s: BatchStatus): string[] => s.rows.filter((r) => r.state === 'waiting' || r.state === 'interrupted' || r.state === 'retrying').map((r) => r.id);
  if (todo(status).length === 0) return { mode: 'slurm', submissions: [], status };
  if (settings.slurm.minutesPerRow === undefined && status.costs.length === 0) {
    const probe = plan.rows.find((r) => r.id === todo(status)[0])!;
    settings.onNote?.(`no row of this batch has finished yet: running row ${probe.id} here to measure the cost of a row (give --minutes-per-row to skip this)`);
    const outcome = await runBatchRow({ ...rowSettings, slurmTask: null }, probe);
    status = batchStatus(out, slurmStatusOptions);
    const measured = status.rows.find((r) => r.id === probe.id)!;
    settings.onNote?.(`row ${probe.id}: ${outcome}, ${measured.seconds.toFixed(1)} s, peak memory ${measured.peakMemoryMb === null ? 'not measured' : `${measured.peakMemoryMb.toFixed(0)} MB`}`);
    // Nothing left, or the probe row failed (its error is in the status): nothing to size a task by.
    if (todo(status).length === 0 || status.costs.length === 0) return { mode: 'slurm', submissions: [], status };
  }
  const resources = slurmResources(settings.slurm, threads, status.costs);
  const taskCommand = [rowSettings.nodePath, rowSettings.cliPath, 'batch', 'task', out, '--threads', String(threads), '--max-attempts', String(maxAttempts)];
  // One job array per maxArraySize tasks (Slurm refuses larger arrays).
  const ids = todo(status);
  const rowsPerArray = (settings.slurm.maxArraySize ?? DEFAULT_MAX_ARRAY_SIZE) * settings.slurm.rowsPerTask;
  const submissions: SlurmSubmission[] = [];
  for (let k = 0; k < ids.length; k += rowsPerArray) {
    submissions.push(await submitBatchToSlurm(out, ids.slice(k, k + rowsPerArray), settings.slurm, resources, taskCommand));
  }
  return { mode: 'slurm', submissions, status };
}
