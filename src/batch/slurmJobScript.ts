import type { SlurmResources } from './slurmSubmission.js';

/** A word for a POSIX shell: single-quoted, each ' written as '\''. */
export function shellWord(word: string): string {
  return /^[A-Za-z0-9_./:=@%+-]+$/.test(word) ? word : `'${word.replace(/'/g, `'\\''`)}'`;
}

export interface SlurmScriptSettings {
  readonly jobName: string;
  readonly taskCount: number;
  readonly resources: SlurmResources;
  /** sbatch --output pattern (%A array job id, %a task id). */
  readonly output: string;
  /** The command every task runs, its last argument the task id (filled in from SLURM_ARRAY_TASK_ID). */
  readonly command: readonly string[];
}

/**
 * The job-array script `sbatch` takes (sbatch(1): #SBATCH lines before the first command):
 * one task per group of rows, each running one `arcsift batch task` process. `set -eu` and
 * `exec` leave no shell line to run after a kill: the process Slurm signals is the runner itself,
 * which records the interruption, and every result file it or the job writes is written
 * atomically.
 */
export function slurmJobScript(settings: SlurmScriptSettings): string {
  const r = settings.resources;
  const lines = [
    '#!/bin/bash',
    `#SBATCH --job-name=${shellWord(settings.jobName)}`,
    `#SBATCH --array=0-${settings.taskCount - 1}${r.maxRunning === null ? '' : `%${r.maxRunning}`}`,
    '#SBATCH --ntasks=1',
    `#SBATCH --cpus-per-task=${r.cpusPerTask}`,
    `#SBATCH --mem=${Math.ceil(r.memoryMb)}M`,
    `#SBATCH --time=${Math.ceil(r.timeMinutes)}`,
    `#SBATCH --output=${shellWord(settings.output)}`,
    ...(r.partition === null ? [] : [`#SBATCH --partition=${shellWord(r.partition)}`]),
    ...(r.account === null ? [] : [`#SBATCH --account=${shellWord(r.account)}`]),
    ...r.extra.map((option) => `#SBATCH ${option}`),
    `# Resources: ${r.basis}`,
    'set -eu',
    `exec ${settings.command.map(shellWord).join(' ')} "$SLURM_ARRAY_TASK_ID"`,
    '',
  ];
  return lines.join('\n');
}
