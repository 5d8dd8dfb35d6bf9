import { batchJobs } from './batchJobs.js';
import { batchLayout } from './batchLayout.js';
import type { BatchPlan } from './batchPlan.js';
import type { BatchRow } from './batchRow.js';

/**
 * The arguments of `arcsift` that run one row: the job's command on the row's config and data,
 * out to the row's folder, resuming from any checkpoints there (a fresh run when there are
 * none), quiet, on `threads` threads, then the batch's run options and the row's own. The
 * runner holds the row's lock, so a run lock left in the row folder is a dead attempt's, also
 * when it was another node's: --take-over-lock lets the command take it.
 */
export function rowCommand(out: string, plan: BatchPlan, row: BatchRow, threads: number): string[] {
  const job = batchJobs[row.job];
  const data: string[] = [];
  if (row.data.folder !== undefined) data.push('--data', row.data.folder);
  for (const key of ['image', 'noise', 'psf', 'mask'] as const) {
    const path = row.data[key];
    if (path !== undefined) data.push(`--${key}`, path);
  }
  return [
    job.command, '--config', row.config, ...data, ...job.arguments(row),
    '--out', batchLayout.rowFolder(out, row.id), '--resume', '--take-over-lock', '--quiet', '--threads', String(threads),
    ...(plan.reports ? [] : ['--no-report']),
    ...(row.seed === undefined ? [] : ['--seed', String(row.seed)]),
    ...plan.runOptions, ...row.options,
  ];
}
