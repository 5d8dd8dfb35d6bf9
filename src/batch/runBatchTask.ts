import { InputError, expectedFound } from '../errors.js';
import { readBatchPlan } from './batchPlan.js';
import { runBatchRow, type RowRunOutcome, type RowRunSettings } from './runBatchRow.js';
import { readSlurmSubmission } from './slurmSubmission.js';

export interface BatchTaskSettings extends Omit<RowRunSettings, 'plan' | 'slurmTask'> {
  readonly submission: number;
  readonly task: number;
  /** `JOBID_TASK` of this task (from SLURM_ARRAY_JOB_ID and SLURM_ARRAY_TASK_ID), or null outside Slurm. */
  readonly slurmTask: string | null;
}

/**
 * What one array task of a Slurm submission does: runs the rows of its group one after the
 * other (runBatchRow: finished rows skipped, interrupted ones resumed, failures retried), and
 * stops at the first interruption. Returns each row's outcome by id.
 */
export async function runBatchTask(settings: BatchTaskSettings): Promise<Map<string, RowRunOutcome>> {
  const plan = readBatchPlan(settings.out);
  const submission = readSlurmSubmission(settings.out, settings.submission);
  const group = submission.groups[settings.task];
  if (group === undefined) throw new InputError(`--task: ${expectedFound(`a task of submission ${settings.submission} (0 to ${submission.groups.length - 1})`, settings.task)}`);
  const rows = new Map(plan.rows.map((r) => [r.id, r]));
  const outcomes = new Map<string, RowRunOutcome>();
  for (const id of group) {
    const row = rows.get(id);
    if (row === undefined) throw new InputError(`row ${id} of submission ${settings.submission} is not in the batch plan`);
    if (settings.signal?.aborted === true) break;
    const outcome = await runBatchRow({ ...settings, plan }, row);
    outcomes.set(id, outcome);
    if (outcome === 'interrupted') break;
  }
  return outcomes;
}
