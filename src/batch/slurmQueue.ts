import { spawnSync } from 'node:child_process';
import { readSlurmSubmission, submissionNumbers } from './slurmSubmission.js';

/**
 * The rows of a batch whose Slurm tasks are still in the queue (pending or running), asking
 * `squeue -h -r -j JOBID -o "%i %T"` (one line per array task) about every submission with a job
 * id. Empty when the batch was never submitted or squeue cannot be run (not on the cluster): the
 * caller then goes by the batch folder's files alone.
 */
export function queuedRows(out: string): Set<string> {
  const queued = new Set<string>();
  for (const number of submissionNumbers(out)) {
    const submission = readSlurmSubmission(out, number);
    if (submission.jobId === null) continue;
    const answer = spawnSync('squeue', ['-h', '-r', '-j', submission.jobId, '-o', '%i %T'], { encoding: 'utf8', timeout: 30_000 });
    if (answer.error !== undefined || answer.status !== 0) continue;
    for (const line of answer.stdout.split('\n')) {
      const match = /^\d+_(\d+)\s+\S+/.exec(line.trim());
      const group = match === null ? undefined : submission.groups[Number(match[1])];
      for (const id of group ?? []) queued.add(id);
    }
  }
  return queued;
}
