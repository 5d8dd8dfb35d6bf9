import type { BatchStatus } from '../batch/batchStatus.js';
import { ROW_STATES } from '../batch/batchStatus.js';
import type { BatchProgress } from '../batch/runBatchLocally.js';

const fixed = (v: number | null | undefined, digits: number): string => (v === null || v === undefined || !Number.isFinite(v) ? '-' : v.toFixed(digits));

/** A duration for people: seconds, minutes or hours. */
export function formatDuration(seconds: number): string {
  if (seconds < 90) return `${Math.round(seconds)} s`;
  if (seconds < 5400) return `${(seconds / 60).toFixed(1)} min`;
  return `${(seconds / 3600).toFixed(1)} h`;
}

/** The status table: one line per row (state, attempts, run time, ln B and verdict or the error), then counts and measured costs. */
export function formatBatchStatus(status: BatchStatus): string {
  const table = [
    ['row', 'job', 'state', 'attempts', 'time', 'ln Z', 'ln B', 'verdict or error'],
    ...status.rows.map((r) => [
      r.id, r.job, r.state, String(r.attempts), r.seconds > 0 ? formatDuration(r.seconds) : '-',
      fixed(r.result?.lnEvidence, 2),
      r.result?.lnBayesFactor === null || r.result === null ? '-' : `${fixed(r.result.lnBayesFactor, 2)} +- ${fixed(r.result.lnBayesFactorError, 2)}`,
      r.state === 'finished' ? (r.result?.verdict ?? r.error ?? '') : (r.error ?? ''),
    ]),
  ];
  const widths = table[0].map((_, c) => Math.max(...table.map((line) => line[c].length)));
  const lines = table.map((line) => `  ${line.map((cell, c) => (c === line.length - 1 ? cell : cell.padEnd(widths[c]))).join('  ')}`.trimEnd());
  lines.push('', `  ${ROW_STATES.filter((s) => status.counts[s] > 0).map((s) => `${status.counts[s]} ${s}`).join(', ')} (of ${status.rows.length})`);
  for (const c of status.costs) {
    lines.push(`  ${c.job}: ${c.finishedRows} finished, ${formatDuration(c.meanSeconds)} per row on average (slowest ${formatDuration(c.maxSeconds)}, ` +
      `${(c.meanCoreSeconds / 3600).toFixed(3)} core-hours), peak memory ${c.peakMemoryMb === null ? 'not measured' : `${c.peakMemoryMb.toFixed(0)} MB`}`);
  }
  return lines.join('\n');
}

/** One progress line of a local batch. */
export function formatBatchProgress(p: BatchProgress): string {
  const left = p.remainingSeconds === null ? '?' : formatDuration(p.remainingSeconds);
  const busy = p.busy > 0 ? `, ${p.busy} held by another runner` : '';
  return `batch: ${p.done}/${p.total} done, ${p.running} running, ${p.failed} failed, ${p.waiting} waiting${busy}; elapsed ${formatDuration(p.elapsedSeconds)}, left ~${left}`;
}
