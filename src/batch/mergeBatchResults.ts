import { csvField } from '../io/csvField.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import { packageVersion } from '../io/packageVersion.js';
import { batchLayout } from './batchLayout.js';
import { batchStatus, type BatchStatus, type BatchStatusRow } from './batchStatus.js';

/** Columns of results.csv, in order. */
export const RESULTS_COLUMNS = [
  'id', 'job', 'state', 'attempts', 'seconds', 'cpuSeconds', 'peakMemoryMb', 'lnEvidence', 'lnBayesFactor', 'lnBayesFactorError', 'verdict', 'error', 'folder',
] as const;

function cells(row: BatchStatusRow): (string | number | null)[] {
  const r = row.result;
  const rounded = (v: number | null, digits: number): string | null => (v === null ? null : v.toFixed(digits));
  return [
    row.id, row.job, row.state, row.attempts, rounded(row.seconds, 1), rounded(row.cpuSeconds, 1), rounded(row.peakMemoryMb, 0),
    r?.lnEvidence ?? null, r?.lnBayesFactor ?? null, r?.lnBayesFactorError ?? null, r?.verdict ?? null,
    row.state === 'finished' ? null : row.error, row.folder,
  ];
}

/** results.csv of a batch status: one line per row, every state, the error where a row did not finish. */
export function formatResultsCsv(status: BatchStatus): string {
  const lines = [RESULTS_COLUMNS.join(','), ...status.rows.map((row) => cells(row).map(csvField).join(','))];
  return `${lines.join('\n')}\n`;
}

/**
 * Merges a batch folder's rows into results.csv and results.json (written atomically, at any
 * time: unfinished rows appear with their state and error). The JSON holds each row with its
 * job's own figures, the failed rows with their messages, the counts and the measured cost per
 * job. Returns the status it merged.
 */
export function mergeBatchResults(out: string, options: { maxAttempts?: number; staleSeconds?: number } = {}): BatchStatus {
  const status = batchStatus(out, options);
  writeFileAtomic(batchLayout.resultsCsv(out), formatResultsCsv(status));
  writeJsonAtomic(batchLayout.resultsJson(out), {
    kind: 'batch-results',
    arcsiftVersion: packageVersion(),
    folder: out,
    counts: status.counts,
    costs: status.costs,
    rows: status.rows,
    failures: status.rows.filter((r) => r.state === 'failed' || r.state === 'retrying').map((r) => ({ id: r.id, job: r.job, state: r.state, attempts: r.attempts, error: r.error })),
  });
  return status;
}
