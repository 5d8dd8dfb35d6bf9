import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { InputError } from '../errors.js';
import { batchLayout } from './batchLayout.js';

/** What each array task of a submission asks Slurm for. */
export interface SlurmResources {
  readonly cpusPerTask: number;
  readonly memoryMb: number;
  readonly timeMinutes: number;
  readonly maxRunning: number | null;
  readonly partition: string | null;
  readonly account: string | null;
  /** Further sbatch options, one per #SBATCH line, as given. */
  readonly extra: readonly string[];
  /** Where the numbers came from, in words (measured rows, a probe, or the user's options). */
  readonly basis: string;
}

/** slurm/submission-N.json: one job array, task k running the rows of groups[k]. */
export interface SlurmSubmission {
  readonly submission: number;
  readonly groups: readonly (readonly string[])[];
  readonly resources: SlurmResources;
  readonly script: string;
  /** The array's job id once sbatch accepted it; null when the script was only written. */
  readonly jobId: string | null;
  readonly writtenAt: string;
}

/** The numbers of the submissions made so far, in order. */
export function submissionNumbers(out: string): number[] {
  const folder = batchLayout.slurmFolder(out);
  if (!existsSync(folder)) return [];
  return readdirSync(folder).map((name) => /^submission-(\d+)\.json$/.exec(name)).filter((m) => m !== null).map((m) => Number(m[1])).sort((a, b) => a - b);
}

export function readSlurmSubmission(out: string, submission: number): SlurmSubmission {
  const file = batchLayout.submissionFile(out, submission);
  if (!existsSync(file)) throw new InputError(`submission ${submission} of this batch not found`, { file });
  return JSON.parse(readFileSync(file, 'utf8')) as SlurmSubmission;
}
