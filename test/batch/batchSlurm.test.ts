import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { batchStatus } from '../../src/batch/batchStatus.js';
import { readRowState } from '../../src/batch/rowState.js';
import { readSlurmSubmission } from '../../src/batch/slurmSubmission.js';
import {
  SLURM_START_HINT, cancelTask, findSlurmCluster, queuedTasks, requireSlurmCluster, slurmRequired, waitForArray, waitForTaskState,
} from './slurmHarness.js';
import {
  LONG_ROW, LONG_ROW_CHECKPOINT, arcsift, batchRunArgs, makeBatchFixture, rowResults, waitForFile, type BatchFixture,
} from './batchFixture.js';

// The same batch on the real Slurm cluster of .ci/slurm.sh: `batch run --slurm` writes a job array
// (one task per row) and submits it with sbatch; one task is cancelled with scancel while its
// row runs (sbatch(1), scancel(1)); submitting again runs only that row, which resumes from its
// checkpoints and ends with results identical to an uninterrupted local run. In CI
// (ARCSIFT_REQUIRE_SLURM) a missing cluster fails these tests; elsewhere they are skipped.
const found = findSlurmCluster();
const skip = !found.ok && !slurmRequired();
const skipNote = skip ? ` (SKIPPED: ${found.reason}; start a test cluster with \`${SLURM_START_HINT}\`)` : '';

let fixture: BatchFixture;
let reference: string;
const jobs: string[] = [];

describe.skipIf(skip)(`batch run --slurm on a real cluster${skipNote}`, () => {
  beforeAll(() => {
    fixture = makeBatchFixture('arcsift-batch-slurm-');
    reference = join(fixture.root, 'reference');
    const run = arcsift(batchRunArgs(fixture, reference, ['--parallel', '2']));
    expect(run.status, run.stderr).toBe(0);
  }, 120_000);

  afterAll(async () => {
    if (found.ok) for (const job of jobs) await cancelTask(found.cluster, job).catch(() => undefined);
    if (fixture !== undefined) rmSync(fixture.root, { recursive: true, force: true });
  });

  it('resubmits a cancelled task\'s row, which resumes and matches the uninterrupted run', async () => {
    const cluster = requireSlurmCluster();
    const out = join(fixture.root, 'slurm');
    // --minutes-per-row skips the local probe row; every client call sees the harness's cluster.
    const submitted = arcsift(batchRunArgs(fixture, out, ['--slurm', '--minutes-per-row', '2']), cluster.env);
    expect(submitted.status, submitted.stderr).toBe(0);
    const first = readSlurmSubmission(out, 1);
    expect(first.jobId).not.toBeNull();
    const job = first.jobId!;
    jobs.push(job);
    expect(submitted.stdout).toContain(`submitted job array ${job}: 3 task(s) for 3 row(s)`);
    const script = readFileSync(first.script, 'utf8');
    expect(script).toMatch(/^#SBATCH --array=0-2$/m);
    expect(script).toMatch(/^#SBATCH --time=14$/m); // 2 min x 2 + 10 min margin
    expect(script).toMatch(/^set -eu$/m);
    expect(script).toMatch(/^exec .* batch task .* --submission 1 --task "\$SLURM_ARRAY_TASK_ID"$/m);

    const task = first.groups.findIndex((g) => g.includes(LONG_ROW));
    await waitForTaskState(cluster, job, task, ['RUNNING'], { timeoutMs: 90_000 });
    await waitForFile(join(out, 'rows', LONG_ROW, LONG_ROW_CHECKPOINT), 90_000);
    await cancelTask(cluster, job, task);
    const ended = await waitForArray(cluster, job, { timeoutMs: 60_000 });
    expect(ended.get(task)?.state).toBe('CANCELLED');
    for (const [k, record] of ended) if (k !== task) expect(record.state, `task ${job}_${k}`).toBe('COMPLETED');

    // The task's runner took SIGTERM: it stopped the row and recorded the interruption, and
    // released the row's lock, so the row reads as interrupted at once.
    const cancelled = batchStatus(out).rows.find((r) => r.id === LONG_ROW)!;
    expect(cancelled.state).toBe('interrupted');
    expect(readRowState(out, LONG_ROW).attempts.at(-1)?.slurmTask).toBe(`${job}_${task}`);

    const again = arcsift(batchRunArgs(fixture, out, ['--slurm', '--minutes-per-row', '2']), cluster.env);
    expect(again.status, again.stderr).toBe(0);
    const second = readSlurmSubmission(out, 2);
    expect(second.groups).toEqual([[LONG_ROW]]);
    jobs.push(second.jobId!);
    const resumed = await waitForArray(cluster, second.jobId!, { timeoutMs: 60_000 });
    expect(resumed.get(0)?.state).toBe('COMPLETED');

    const attempts = readRowState(out, LONG_ROW).attempts;
    expect(attempts.map((a) => a.outcome)).toEqual(['interrupted', 'finished']);
    expect(attempts[1].resumed).toBe(true);
    for (const id of ['smooth-a', LONG_ROW, 'fit-c']) expect(rowResults(out, id)).toEqual(rowResults(reference, id));
    const nothing = arcsift(batchRunArgs(fixture, out, ['--slurm', '--minutes-per-row', '2']), cluster.env);
    expect(nothing.stdout).toMatch(/^nothing to submit/);
  }, 180_000);

  it('does not submit again the rows whose tasks still wait in the queue', async () => {
    const cluster = requireSlurmCluster();
    const out = join(fixture.root, 'held');
    // sbatch --hold leaves the whole array pending until released (sbatch(1)).
    const held = arcsift(batchRunArgs(fixture, out, ['--slurm', '--minutes-per-row', '2', '--sbatch=--hold']), cluster.env);
    expect(held.status, held.stderr).toBe(0);
    const job = readSlurmSubmission(out, 1).jobId!;
    jobs.push(job);
    expect(readFileSync(readSlurmSubmission(out, 1).script, 'utf8')).toMatch(/^#SBATCH --hold$/m);
    const status = arcsift(['batch', 'status', out], cluster.env);
    expect(status.stdout).toMatch(/3 queued \(of 3\)/);
    const again = arcsift(batchRunArgs(fixture, out, ['--slurm', '--minutes-per-row', '2']), cluster.env);
    expect(again.stdout).toMatch(/^nothing to submit/);
    await cancelTask(cluster, job);
    // A cancelled pending array leaves one record for all its tasks ("0-2"): wait for the queue instead.
    for (const deadline = Date.now() + 30_000; (await queuedTasks(cluster, job)).size > 0;) {
      if (Date.now() > deadline) throw new Error(`job ${job} still queued 30 s after scancel`);
      await new Promise((resolve) => setTimeout(resolve, 250));
    }
    expect(arcsift(['batch', 'status', out], cluster.env).stdout).toMatch(/3 waiting \(of 3\)/);
  }, 60_000);
});
