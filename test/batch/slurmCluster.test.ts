import { chmodSync, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import {
  SLURM_START_HINT,
  cancelTask,
  findSlurmCluster,
  queuedTasks,
  requireSlurmCluster,
  slurmRequired,
  submitArray,
  waitForArray,
  waitForTaskState,
} from './slurmHarness.js';

// The cluster that the batch tests run on, checked on its own: job arrays run one task per array
// index with SLURM_ARRAY_TASK_ID set, and `scancel JOBID_TASK` ends that one task and its
// processes while its siblings finish (sbatch(1), scancel(1)). In CI (.ci/run starts the cluster
// and sets ARCSIFT_REQUIRE_SLURM) a missing cluster fails these tests; elsewhere they are skipped.
const found = findSlurmCluster();
const skip = !found.ok && !slurmRequired();
const skipNote = skip ? ` (SKIPPED: ${found.reason}; start a test cluster with \`${SLURM_START_HINT}\`)` : '';
if (skip) console.warn(`test/batch/slurmCluster.test.ts: skipped, ${found.reason}; start a test cluster with \`${SLURM_START_HINT}\``);

const folders: string[] = [];
const jobs: string[] = [];

function scratch(): string {
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-slurm-smoke-'));
  folders.push(folder);
  return folder;
}

function script(folder: string, body: string): string {
  const path = join(folder, 'task.sh');
  writeFileSync(path, `#!/bin/sh\n${body}`);
  chmodSync(path, 0o755);
  return path;
}

// A process that exists and has not exited: a zombie (exited, not yet reaped by init, which
// here can take a second or two) counts as gone. Field 3 of /proc/PID/stat is the state (proc(5)).
function alive(pid: number): boolean {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    return stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3) !== 'Z';
  } catch {
    return false;
  }
}

describe.skipIf(skip)(`a real Slurm cluster${skipNote}`, () => {
  afterAll(async () => {
    if (found.ok) for (const job of jobs) await cancelTask(found.cluster, job).catch(() => undefined);
    for (const folder of folders) rmSync(folder, { recursive: true, force: true });
  });

  it('runs a 3-task job array, each task seeing its own SLURM_ARRAY_TASK_ID', async () => {
    const cluster = requireSlurmCluster();
    const folder = scratch();
    const task = script(folder, 'echo "$SLURM_ARRAY_TASK_ID" > "$1/task-$SLURM_ARRAY_TASK_ID.txt"\n');
    const job = await submitArray(cluster, task, {
      array: '0-2', output: join(folder, 'slurm-%A_%a.out'), chdir: folder, scriptArgs: [folder],
    });
    jobs.push(job);
    const tasks = await waitForArray(cluster, job, { timeoutMs: 60_000 });
    expect([...tasks.keys()].sort()).toEqual([0, 1, 2]);
    for (const id of [0, 1, 2]) {
      expect(tasks.get(id)?.state, `task ${job}_${id}`).toBe('COMPLETED');
      expect(tasks.get(id)?.exitCode).toBe('0:0');
      expect(readFileSync(join(folder, `task-${id}.txt`), 'utf8')).toBe(`${id}\n`);
    }
  }, 90_000);

  it('scancel JOBID_TASK ends one running task and its processes; the other tasks complete', async () => {
    const cluster = requireSlurmCluster();
    const folder = scratch();
    // Task 1 records the shell's and the sleep's pids, so the test can see that both are gone.
    // SIGTERM reaches the shell and the sleep at nearly the same moment, and once in a while the
    // shell outlives the sleep long enough to run its next line (seen here, rarely):
    // `set -e` stops it at the sleep's failure, as a batch script must not carry on after a kill.
    const task = script(folder, [
      'set -e',
      'echo start',
      'if [ "$SLURM_ARRAY_TASK_ID" = 1 ]; then',
      '  sleep 60 & echo "$$ $!" > "$1/pids-1"',
      '  wait "$!"',
      'fi',
      'echo end',
      '',
    ].join('\n'));
    const started = Date.now();
    const job = await submitArray(cluster, task, {
      array: '0-2', output: join(folder, 'task-%a.out'), chdir: folder, scriptArgs: [folder],
    });
    jobs.push(job);
    await waitForTaskState(cluster, job, 1, ['RUNNING'], { timeoutMs: 30_000 });
    const pidFile = join(folder, 'pids-1');
    for (const deadline = Date.now() + 30_000; !existsSync(pidFile) || readFileSync(pidFile, 'utf8').trim().split(' ').length < 2;) {
      if (Date.now() > deadline) throw new Error(`task ${job}_1 is RUNNING but wrote no ${pidFile} in 30 s`);
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    const pids = readFileSync(pidFile, 'utf8').trim().split(' ').map(Number);
    expect((await queuedTasks(cluster, job)).get(`${job}_1`)).toBe('RUNNING');
    await cancelTask(cluster, job, 1);

    const tasks = await waitForArray(cluster, job, { timeoutMs: 45_000 });
    // Well under the task's 60 s sleep: the cancellation, not the sleep's end, finished it.
    expect(Date.now() - started).toBeLessThan(50_000);
    for (const id of [0, 2]) {
      expect(tasks.get(id)?.state, `task ${job}_${id}`).toBe('COMPLETED');
      expect(readFileSync(join(folder, `task-${id}.out`), 'utf8')).toBe('start\nend\n');
    }
    expect(tasks.get(1)?.state).toBe('CANCELLED');
    const cancelledOutput = readFileSync(join(folder, 'task-1.out'), 'utf8');
    expect(cancelledOutput.startsWith('start\n')).toBe(true);
    expect(cancelledOutput).not.toMatch(/^end$/m);
    // slurmstepd notes the cancellation in the task's output (observed with Slurm 22.05).
    expect(cancelledOutput).toMatch(/CANCELLED/);
    // SIGTERM, then SIGKILL after KillWait (2 s in .ci/slurm.sh): allow 15 s for both to be gone.
    for (const deadline = Date.now() + 15_000; pids.some(alive) && Date.now() < deadline;) {
      await new Promise((resolve) => setTimeout(resolve, 200));
    }
    expect(pids.filter(alive), 'processes of the cancelled task still alive').toEqual([]);
  }, 120_000);
});
