import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { batchStatus } from '../../src/batch/batchStatus.js';
import { readRowState } from '../../src/batch/rowState.js';
import {
  LONG_ROW, LONG_ROW_CHECKPOINT, arcsift, batchRunArgs, makeBatchFixture, rowResults, startGroup, waitForFile, type BatchFixture,
} from './batchFixture.js';

// A batch run on this machine: it finishes every row, a second run changes nothing, and a batch
// whose runner is killed outright (its whole process group, as when a node goes down) resumes on
// the next run and ends with results identical, byte for byte, to the uninterrupted batch: the
// contract of arcsift's checkpoints (a resumed nested run continues bit for bit; common practice
// of checkpointing samplers).

let fixture: BatchFixture;
let reference: string;

beforeAll(() => {
  fixture = makeBatchFixture('arcsift-batch-local-');
  reference = join(fixture.root, 'reference');
  const run = arcsift(batchRunArgs(fixture, reference, ['--parallel', '2']));
  expect(run.status, run.stderr).toBe(0);
}, 120_000);

afterAll(() => {
  if (fixture !== undefined) rmSync(fixture.root, { recursive: true, force: true });
});

describe('batch run on this machine', () => {
  it('finishes every row, reports it in status and merge, and a second run changes nothing', () => {
    const status = batchStatus(reference);
    expect(status.rows.map((r) => [r.id, r.state, r.attempts])).toEqual([
      ['smooth-a', 'finished', 1], [LONG_ROW, 'finished', 1], ['fit-c', 'finished', 1],
    ]);
    const compare = status.rows.find((r) => r.id === LONG_ROW)!;
    const summary = JSON.parse(readFileSync(join(compare.folder, 'summary.json'), 'utf8'));
    expect(compare.result?.lnBayesFactor).toBe(summary.bayesFactor.lnBayesFactor);
    expect(compare.result?.verdict).toMatch(/ for (perturbed|smooth)$/);
    expect(status.costs.map((c) => c.job).sort()).toEqual(['compare', 'fit']);

    const csv = readFileSync(join(reference, 'results.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('id,job,state,attempts,seconds,cpuSeconds,peakMemoryMb,lnEvidence,lnBayesFactor,lnBayesFactorError,verdict,error,folder');
    expect(csv).toHaveLength(4);
    const json = JSON.parse(readFileSync(join(reference, 'results.json'), 'utf8'));
    expect(json.counts.finished).toBe(3);
    expect(json.failures).toEqual([]);

    const again = arcsift(batchRunArgs(fixture, reference));
    expect(again.status, again.stderr).toBe(0);
    for (const id of ['smooth-a', LONG_ROW, 'fit-c']) expect(readRowState(reference, id).attempts).toHaveLength(1);
  });

  it('refuses to reuse the folder with other job options', () => {
    const other = arcsift(['batch', 'run', fixture.manifest, '--out', reference, '--quiet', '--', '--live-points', '25']);
    expect(other.status).toBe(2);
    expect(other.stderr).toMatch(/ran with the job options "--live-points 20 .*"; give the same ones to resume it/);
  });

  it('resumes a batch whose runner was killed outright, with results identical to the uninterrupted one', async () => {
    const out = join(fixture.root, 'killed');
    const runner = startGroup(batchRunArgs(fixture, out, ['--parallel', '2']));
    await waitForFile(join(out, 'rows', LONG_ROW, LONG_ROW_CHECKPOINT), 60_000);
    process.kill(-runner.pid!, 'SIGKILL');
    await new Promise((resolve) => runner.on('exit', resolve));
    // The runner's exit comes before its children (the rows' arcsift runs) are gone; until then a
    // row's lock names a live pid and the resume below rightly refuses to take it over.
    for (const deadline = Date.now() + 30_000; groupAlive(runner.pid!);) {
      if (Date.now() > deadline) throw new Error('the killed runner\'s children outlived 30 s');
      await new Promise((resolve) => { setTimeout(resolve, 50); });
    }
    expect(existsSync(join(out, 'rows', LONG_ROW, 'summary.json'))).toBe(false);
    // No half-written file is left anywhere in the batch folder.
    expect(readdirSync(out, { recursive: true }).map(String).filter((f) => f.endsWith('.tmp'))).toEqual([]);
    // The lock of the killed runner is fresh: until it goes stale the row reads as running
    // (another runner may hold it); its attempt has no end.
    expect(batchStatus(out).rows.find((r) => r.id === LONG_ROW)!.state).toBe('running');
    expect(batchStatus(out, { staleSeconds: 0 }).rows.find((r) => r.id === LONG_ROW)!.state).toBe('interrupted');
    rmSync(join(out, 'locks'), { recursive: true, force: true }); // as a stale lock would be taken over after staleSeconds

    const resumed = arcsift(batchRunArgs(fixture, out, ['--parallel', '2']));
    expect(resumed.status, resumed.stderr).toBe(0);
    const attempts = readRowState(out, LONG_ROW).attempts;
    expect(attempts.length).toBeGreaterThanOrEqual(2);
    expect(attempts[0].outcome).toBeNull();
    expect(attempts.at(-1)!.resumed).toBe(true);
    expect(attempts.at(-1)!.outcome).toBe('finished');
    for (const id of ['smooth-a', LONG_ROW, 'fit-c']) expect(rowResults(out, id)).toEqual(rowResults(reference, id));
  });
});

/** True while any process of the group `pid` leads is alive (kill with signal 0 tests, sends nothing). */
function groupAlive(pid: number): boolean {
  try {
    process.kill(-pid, 0);
    return true;
  } catch {
    return false;
  }
}
