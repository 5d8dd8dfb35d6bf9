import { describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { runBatch } from '../../src/batch/runBatch.js';
import { shellWord, slurmJobScript } from '../../src/batch/slurmJobScript.js';
import { slurmResources } from '../../src/batch/submitBatchToSlurm.js';

// The job-array script as sbatch(1) reads it (#SBATCH lines before the first command), written
// without submitting (--no-submit), so these checks need no cluster: arrays split at the
// cluster's array size, resources from the measured cost, and words quoted for a POSIX shell
// (checked by running them through sh).

describe('Slurm job-array scripts', () => {
  it('quotes words so that sh reads them back unchanged', () => {
    const words = ['/plain/path', 'with space', "it's", '$HOME', 'a"b', '--x=1'];
    const r = spawnSync('sh', ['-c', `printf '%s\\n' ${words.map(shellWord).join(' ')}`], { encoding: 'utf8' });
    expect(r.stdout.split('\n').slice(0, -1)).toEqual(words);
  });

  it('sizes each task from the measured cost: rows x slowest row x 2 + 10 min, peak memory x 1.5', () => {
    const costs = [
      { job: 'fit', finishedRows: 3, meanSeconds: 100, maxSeconds: 150, meanCoreSeconds: 100, peakMemoryMb: 300 },
      { job: 'compare', finishedRows: 2, meanSeconds: 400, maxSeconds: 480, meanCoreSeconds: 800, peakMemoryMb: 500 },
    ];
    const r = slurmResources({ rowsPerTask: 4 }, 2, costs);
    expect([r.cpusPerTask, r.timeMinutes, r.memoryMb]).toEqual([2, Math.ceil((4 * 480 * 2) / 60 + 10), 750]);
    const given = slurmResources({ rowsPerTask: 1, minutesPerRow: 30, memoryPerRowMb: 4000, partition: 'long' }, 1, []);
    expect([given.timeMinutes, given.memoryMb, given.partition]).toEqual([70, 4000, 'long']);
    const script = slurmJobScript({ jobName: 'survey', taskCount: 7, resources: { ...given, maxRunning: 3, extra: ['--qos=low'] }, output: '/o/task-%A_%a.out', command: ['/usr/bin/node', '/a b/main.js', 'batch', 'task', '/out', '--task'] });
    expect(script.split('\n')).toEqual([
      '#!/bin/bash', '#SBATCH --job-name=survey', '#SBATCH --array=0-6%3', '#SBATCH --ntasks=1', '#SBATCH --cpus-per-task=1',
      '#SBATCH --mem=4000M', '#SBATCH --time=70', '#SBATCH --output=/o/task-%A_%a.out', '#SBATCH --partition=long', '#SBATCH --qos=low',
      `# Resources: ${given.basis}`, 'set -eu', `exec /usr/bin/node '/a b/main.js' batch task /out --task "$SLURM_ARRAY_TASK_ID"`, '',
    ]);
  });

  it('splits a batch into job arrays of at most --max-array-size tasks', async () => {
    const root = mkdtempSync(join(tmpdir(), 'arcsift-sbatch-'));
    writeFileSync(join(root, 'lens.yaml'), 'title: x\n');
    const ids = ['a', 'b', 'c', 'd', 'e'];
    for (const id of ids) mkdirSync(join(root, id));
    writeFileSync(join(root, 'm.csv'), ['id,job,config,data', ...ids.map((id) => `${id},fit,lens.yaml,${id}`)].join('\n'));
    const outcome = await runBatch({
      manifest: join(root, 'm.csv'), out: join(root, 'batch'), threads: 2,
      slurm: { rowsPerTask: 2, minutesPerRow: 5, maxArraySize: 2, noSubmit: true },
    });
    expect(outcome.mode).toBe('slurm');
    if (outcome.mode !== 'slurm') return;
    expect(outcome.submissions.map((s) => [s.submission, s.groups, s.jobId])).toEqual([[1, [['a', 'b'], ['c', 'd']], null], [2, [['e']], null]]);
    const script = readFileSync(outcome.submissions[0].script, 'utf8');
    expect(script).toMatch(/^#SBATCH --array=0-1$/m);
    expect(script).toMatch(/^#SBATCH --cpus-per-task=2$/m);
    expect(script).toMatch(/^#SBATCH --time=30$/m);
    expect(script).toMatch(/ batch task \S+ --threads 2 --max-attempts 3 --submission 1 --task "\$SLURM_ARRAY_TASK_ID"$/m);
    expect(readFileSync(outcome.submissions[1].script, 'utf8')).toMatch(/^#SBATCH --array=0-0$/m);
  });
});
