import { join } from 'node:path';

/**
 * Where a batch keeps its files, all under its folder `out`:
 * - `batch.json`: the plan (rows and run options), written once;
 * - `rows/ID/`: the run folder of row ID (the job's --out);
 * - `state/ID.json`: its attempts (start, end, outcome, message, seconds, memory);
 * - `locks/ID.lock`: held while the row runs, touched every heartbeat;
 * - `logs/ID.log`: the job's output;
 * - `slurm/`: job-array scripts, submissions and the tasks' output;
 * - `results.csv`, `results.json`: the merged table.
 */
export const batchLayout = {
  plan: (out: string): string => join(out, 'batch.json'),
  rowFolder: (out: string, id: string): string => join(out, 'rows', id),
  stateFile: (out: string, id: string): string => join(out, 'state', `${id}.json`),
  lockFile: (out: string, id: string): string => join(out, 'locks', `${id}.lock`),
  logFile: (out: string, id: string): string => join(out, 'logs', `${id}.log`),
  slurmFolder: (out: string): string => join(out, 'slurm'),
  submissionFile: (out: string, submission: number): string => join(out, 'slurm', `submission-${submission}.json`),
  scriptFile: (out: string, submission: number): string => join(out, 'slurm', `submission-${submission}.sh`),
  resultsCsv: (out: string): string => join(out, 'results.csv'),
  resultsJson: (out: string): string => join(out, 'results.json'),
} as const;
