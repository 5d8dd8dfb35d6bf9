import { describe, expect, it } from 'vitest';
import { chmodSync, mkdirSync, mkdtempSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { acquireRowLock } from '../../src/batch/rowLock.js';
import { batchStatus } from '../../src/batch/batchStatus.js';
import { runBatch } from '../../src/batch/runBatch.js';
import { readRowState } from '../../src/batch/rowState.js';

// Retries, given-up rows and locks, with a stand-in for the arcsift command line (a small node
// script that fails or succeeds as its row's data folder tells it), so that only the batch's own
// logic is under test: a failure is retried up to maxAttempts, a user mistake (exit status 2,
// arcsift's contract) is not, and a lock is taken over only once stale.

const standIn = `
const fs = require('node:fs');
const path = require('node:path');
const args = process.argv.slice(2);
const out = args[args.indexOf('--out') + 1];
const data = args[args.indexOf('--data') + 1];
const plan = JSON.parse(fs.readFileSync(path.join(data, 'plan.json'), 'utf8'));
const countFile = path.join(data, 'count');
const count = (fs.existsSync(countFile) ? Number(fs.readFileSync(countFile, 'utf8')) : 0) + 1;
fs.writeFileSync(countFile, String(count));
if (count <= plan.failures) { process.stderr.write('arcsift: internal error: failure ' + count + '\\n'); process.exit(plan.status); }
fs.mkdirSync(out, { recursive: true });
fs.writeFileSync(path.join(out, 'summary.json'), JSON.stringify({ kind: 'fit', sampler: 'nested', perturberCount: 0, evidence: { lnEvidence: -count, lnEvidenceError: 0.1 }, model: { stopReason: 'converged', parameters: [] } }));
process.exit(plan.finalStatus ?? 0);
`;

function scratch(rows: { id: string; failures: number; status: number; finalStatus?: number }[]): { root: string; manifest: string; cli: string } {
  const root = mkdtempSync(join(tmpdir(), 'arcsift-retry-'));
  const cli = join(root, 'stand-in.cjs');
  writeFileSync(cli, standIn);
  chmodSync(cli, 0o755);
  writeFileSync(join(root, 'lens.yaml'), 'title: x\n');
  for (const row of rows) {
    mkdirSync(join(root, row.id));
    writeFileSync(join(root, row.id, 'plan.json'), JSON.stringify(row));
  }
  const manifest = join(root, 'm.csv');
  writeFileSync(manifest, ['id,job,config,data', ...rows.map((r) => `${r.id},fit,lens.yaml,${r.id}`)].join('\n'));
  return { root, manifest, cli };
}

describe('batch rows that fail', () => {
  it('retries a failing row up to maxAttempts, gives up a user mistake at once, and reports both', async () => {
    const s = scratch([
      { id: 'flaky', failures: 2, status: 1 },
      { id: 'broken', failures: 9, status: 1 },
      { id: 'mistake', failures: 9, status: 2 },
    ]);
    const out = join(s.root, 'batch');
    const outcome = await runBatch({ manifest: s.manifest, out, cliPath: s.cli, maxAttempts: 3, parallel: 1 });
    expect(outcome.mode).toBe('local');
    if (outcome.mode !== 'local') return;
    expect(Object.fromEntries(outcome.outcomes)).toEqual({ flaky: 'finished', broken: 'failed', mistake: 'failed' });
    expect(readRowState(out, 'flaky').attempts.map((a) => a.outcome)).toEqual(['failed', 'failed', 'finished']);
    expect(readRowState(out, 'broken').attempts).toHaveLength(3);
    expect(readRowState(out, 'mistake').attempts).toHaveLength(1);
    const status = batchStatus(out);
    expect(status.rows.map((r) => [r.id, r.state])).toEqual([['flaky', 'finished'], ['broken', 'failed'], ['mistake', 'failed']]);
    expect(status.rows[1].error).toBe('internal error: failure 3');
    expect(status.rows[0].result?.lnEvidence).toBe(-3);

    // With more attempts allowed, the next run tries the given-up failure again, not the mistake.
    const more = await runBatch({ manifest: s.manifest, out, cliPath: s.cli, maxAttempts: 4, parallel: 1 });
    expect(more.mode === 'local' && Object.fromEntries(more.outcomes)).toEqual({ flaky: 'already-finished', broken: 'failed', mistake: 'failed' });
    expect(readRowState(out, 'broken').attempts).toHaveLength(4);
    expect(readRowState(out, 'mistake').attempts).toHaveLength(1);
  });

  it('counts a command stopped by its own signal (status 4) as interrupted, and one a limit cut short (status 3) as finished', async () => {
    // arcsift's exit statuses (src/errors.ts EXIT_STATUS): 4 after SIGTERM with a last
    // checkpoint written, 3 when a limit cut the run short and its summary says finished: false.
    const s = scratch([
      { id: 'signalled', failures: 1, status: 4 },
      { id: 'limited', failures: 0, status: 0, finalStatus: 3 },
    ]);
    const out = join(s.root, 'batch');
    const first = await runBatch({ manifest: s.manifest, out, cliPath: s.cli, maxAttempts: 1, parallel: 1 });
    expect(first.mode === 'local' && Object.fromEntries(first.outcomes)).toEqual({ signalled: 'interrupted', limited: 'finished' });
    expect(readRowState(out, 'signalled').attempts.map((a) => [a.outcome, a.exitCode])).toEqual([['interrupted', 4]]);
    expect(readRowState(out, 'limited').attempts.map((a) => [a.outcome, a.exitCode, a.message])).toEqual([
      ['finished', 3, 'cut short by a limit of its options: its summary says finished: false'],
    ]);
    // An interruption is no failure: with one attempt allowed, the next run still resumes the row.
    const second = await runBatch({ manifest: s.manifest, out, cliPath: s.cli, maxAttempts: 1, parallel: 1 });
    expect(second.mode === 'local' && Object.fromEntries(second.outcomes)).toEqual({ signalled: 'finished', limited: 'already-finished' });
  });

  it('takes a row\'s lock only when free or stale', () => {
    const root = mkdtempSync(join(tmpdir(), 'arcsift-lock-'));
    const first = acquireRowLock(root, 'r', 60, 'first');
    expect(first).not.toBeNull();
    expect(acquireRowLock(root, 'r', 60, 'second')).toBeNull();
    const old = new Date(Date.now() - 120_000);
    utimesSync(join(root, 'locks', 'r.lock'), old, old);
    const second = acquireRowLock(root, 'r', 60, 'second');
    expect(second).not.toBeNull();
    expect(acquireRowLock(root, 'r', 60, 'third')).toBeNull();
    second!.release();
    expect(acquireRowLock(root, 'r', 60, 'third')).not.toBeNull();
  });
});
