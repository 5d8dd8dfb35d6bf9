import { startArcsift, until } from '../support/childRun.js';
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { canMount, smallFileSystem, unwritableFolder } from '../support/fileSystemPlaces.js';

// One run per output folder, runs that survive signals and file-system faults, through the
// command line (arcsift's own contract; the scheduler's SIGTERM before a kill at a time limit is
// common practice on clusters). Signals are real ones sent to a child process; file systems are
// real ones: a read-only and a full tmpfs where this process may mount (root in a container, as
// in CI), a folder the child may not write (run as the user nobody when this process is root).
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const fixture = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

let root: string;
let config: string;
let data: string;

function arcsift(args: readonly string[], as: { uid?: number; gid?: number } = {}): { status: number | null; stdout: string; stderr: string } {
  const run = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', timeout: 180_000, ...as });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

const start = startArcsift;

const nested = (out: string, livePoints = 30): string[] => [
  'fit', '--config', config, '--data', data, '--out', out, '--perturbers', '0', '--live-points', String(livePoints), '--method', 'slice',
  '--tolerance', '0.5', '--threads', '1', '--seed', '5', '--quiet', '--no-report',
];
// Live points of the run stopped by a signal: its whole run takes about 11 s of CPU, so it is
// still sampling after the 1.5 s wait and the two refused starts on a quiet, fast machine (with
// 30 live points, 4 s, the margin was about a second).
const LONG = 90;
const noStackTrace = (text: string): void => { expect(text).not.toMatch(/\n\s+at /); };
const leftovers = (folder: string): string[] => readdirSync(folder, { recursive: true }).map(String).filter((f) => f.endsWith('.tmp') || f.endsWith('.lock'));

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'arcsift-folder-'));
  chmodSync(root, 0o755); // readable by the unprivileged child of the permission test
  config = join(root, 'lens.yaml');
  writeFileSync(config, readFileSync(fixture, 'utf8'));
  data = join(root, 'data');
  expect(arcsift(['simulate', '--config', config, '--out', data, '--seed', '3']).status).toBe(0);
});

describe('one run per output folder, and SIGTERM', () => {
  it('refuses a second run and a resume while the first runs; SIGTERM writes a last checkpoint and the resume ends as an uninterrupted run', async () => {
    const whole = arcsift(nested(join(root, 'whole'), LONG));
    expect(whole.status, whole.stderr).toBe(0);

    const out = join(root, 'stopped');
    // No checkpoint is due for an hour: the one found after the signal is the signal's.
    const first = start([...nested(out, LONG), '--checkpoint-seconds', '3600']);
    await until(() => existsSync(join(out, 'arcsift.lock')));
    await new Promise((resolve) => { setTimeout(resolve, 1500); }); // into the sampling loop
    const pid = first.child.pid;
    const second = arcsift(nested(out, LONG));
    expect(second.status).toBe(2);
    expect(second.stderr).toContain(`arcsift: ${join(out, 'arcsift.lock')}: another arcsift run uses this folder (pid ${pid} on ${hostname()}, started `);
    const resumeMeanwhile = arcsift([...nested(out, LONG), '--resume']);
    expect(resumeMeanwhile.status).toBe(2);
    expect(resumeMeanwhile.stderr).toContain('another arcsift run uses this folder');
    expect(existsSync(join(out, 'checkpoint.json'))).toBe(false);

    first.child.kill('SIGTERM');
    expect(await first.exited).toBe(4);
    expect(first.stderr()).toContain('arcsift: SIGTERM received: ending the current step and writing a last checkpoint');
    expect(first.stderr()).toContain(`arcsift: stopped on request; checkpoints written: ${join(out, 'checkpoint.json')}`);
    expect(first.stderr()).toMatch(/arcsift: continue with: arcsift fit --config .* --checkpoint-seconds 3600 --resume\n/);
    expect(existsSync(join(out, 'checkpoint.json'))).toBe(true);
    expect(existsSync(join(out, 'summary.json'))).toBe(false);
    expect(leftovers(out)).toEqual([]);

    const resumed = arcsift([...nested(out, LONG), '--checkpoint-seconds', '3600', '--resume']);
    expect(resumed.status, resumed.stderr).toBe(0);
    expect(readFileSync(join(out, 'posterior-weighted.csv'), 'utf8')).toBe(readFileSync(join(root, 'whole', 'posterior-weighted.csv'), 'utf8'));
    expect(leftovers(out)).toEqual([]);
  }, 300_000);

  it('takes over a lock left on this host by a run that is gone, saying so', () => {
    const out = join(root, 'stale');
    const gone = spawnSync(process.execPath, ['-e', '']).pid; // a process that has ended
    mkdirSync(out);
    const lock = { pid: gone, host: hostname(), processStart: null, startedAt: '2026-01-01T00:00:00.000Z', command: 'arcsift fit (killed)' };
    writeFileSync(join(out, 'arcsift.lock'), JSON.stringify(lock));
    const run = arcsift([...nested(out), '--max-evaluations', '200']);
    expect(run.status, run.stderr).toBe(3);
    expect(run.stderr).toContain(`arcsift: notice: took over the lock of ${out} from pid ${gone} on ${hostname()}, started 2026-01-01T00:00:00.000Z: arcsift fit (killed), which no longer runs`);
    expect(existsSync(join(out, 'arcsift.lock'))).toBe(false);
  });

  it('refuses a lock held on another host unless --take-over-lock', () => {
    const out = join(root, 'elsewhere');
    mkdirSync(out);
    writeFileSync(join(out, 'arcsift.lock'), JSON.stringify({ pid: 1, host: 'node-17', processStart: null, startedAt: 'then', command: 'arcsift fit' }));
    const refused = arcsift([...nested(out), '--max-evaluations', '200']);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toContain(`an arcsift run on another host holds this folder (pid 1 on node-17, started then: arcsift fit), and whether it still runs cannot be told from ${hostname()}; if it no longer does, pass --take-over-lock`);
    expect(JSON.parse(readFileSync(join(out, 'arcsift.lock'), 'utf8')).host).toBe('node-17');
    const taken = arcsift([...nested(out), '--max-evaluations', '200', '--take-over-lock']);
    expect(taken.status, taken.stderr).toBe(3);
    expect(taken.stderr).toContain('as --take-over-lock asked');
  });
});

describe('file-system faults are user errors naming the path, found before sampling', () => {
  it.skipIf(!canMount)('a read-only file system (a recursive mkdir there says ENOENT; the message says EROFS)', () => {
    const fs = smallFileSystem({ sizeKb: 64, readOnly: true });
    try {
      const run = arcsift(nested(join(fs.path, 'runs', 'a')));
      expect(run.status).toBe(2);
      expect(run.stderr).toBe(`arcsift: ${join(fs.path, 'runs', 'a')}: cannot write the output folder: the file system is read-only (EROFS)\n`);
    } finally {
      fs.unmount();
    }
  });

  it.skipIf(!canMount)('a full file system: before sampling when the lock does not fit, at the first checkpoint otherwise, leaving nothing', () => {
    const fs = smallFileSystem({ sizeKb: 8 });
    try {
      writeFileSync(join(fs.path, 'filler'), Buffer.alloc(8192)); // both 4 kB pages
      const full = arcsift(nested(join(fs.path, 'a')));
      expect(full.status).toBe(2);
      expect(full.stderr).toBe(`arcsift: ${join(fs.path, 'a', 'arcsift.lock')}: cannot write the lock file of the output folder: no space left on the device (ENOSPC)\n`);
      expect(readdirSync(fs.path)).toEqual(['filler']);
      writeFileSync(join(fs.path, 'filler'), Buffer.alloc(4096)); // one page left: the lock fits, a checkpoint does not
      const later = arcsift([...nested(join(fs.path, 'b')), '--checkpoint-seconds', '0.01']);
      expect(later.status).toBe(2);
      expect(later.stderr).toBe(`arcsift: ${join(fs.path, 'b', 'checkpoint.json')}: cannot write the file: no space left on the device (ENOSPC)\n`);
      expect(readdirSync(fs.path)).toEqual(['filler']);
    } finally {
      fs.unmount();
    }
  });

  it('a folder it may not write', () => {
    const place = unwritableFolder(root);
    const run = arcsift(nested(join(place.path, 'run')), place.spawnAs);
    expect(run.status).toBe(2);
    expect(run.stderr).toBe(`arcsift: ${join(place.path, 'run')}: cannot write the output folder: permission denied (EACCES)\n`);
    expect(readdirSync(place.path)).toEqual([]);
  });

  it('a file where the output folder, or a folder above it, should be', () => {
    const file = join(root, 'a-file');
    writeFileSync(file, 'not a folder');
    const below = arcsift(nested(join(file, 'run')));
    expect(below.status).toBe(2);
    expect(below.stderr).toBe(`arcsift: ${join(file, 'run')}: cannot write the output folder: a file stands where a folder is needed on this path (ENOTDIR)\n`);
    const at = arcsift(nested(file));
    expect(at.status).toBe(2);
    expect(at.stderr).toBe(`arcsift: ${file}: cannot write the output folder: a file stands where a folder is needed (EEXIST)\n`);
    noStackTrace(at.stderr);
  });
});

describe('a comparison under SIGTERM', () => {
  it('stops both models with their last checkpoints, and the command it prints resumes to the uninterrupted Bayes factor', async () => {
    const compare = (out: string): string[] => [
      'compare', '--config', config, '--data', data, '--out', out, '--live-points', '40', '--method', 'slice', '--tolerance', '0.5',
      '--threads', '2', '--seed', '6', '--quiet', '--no-report', '--checkpoint-seconds', '3600',
    ];
    const whole = arcsift(compare(join(root, 'compare-whole')));
    expect(whole.status, whole.stderr).toBe(0);

    const out = join(root, 'compare-stopped');
    const run = start(compare(out));
    await until(() => existsSync(join(out, 'arcsift.lock')));
    // Both models sampling, side by side: the whole comparison takes about 19 s of CPU (20 live
    // points, 5 s, left a margin of about 2 s on a quiet machine).
    await new Promise((resolve) => { setTimeout(resolve, 2500); });
    run.child.kill('SIGTERM');
    expect(await run.exited).toBe(4);
    // No checkpoint was due for an hour: both are the signal's.
    expect(run.stderr()).toContain(`checkpoints written: ${join(out, 'smooth', 'checkpoint.json')}, ${join(out, 'perturbed', 'checkpoint.json')}`);
    expect(existsSync(join(out, 'summary.json'))).toBe(false);
    expect(leftovers(out)).toEqual([]);

    // The printed command line, run as printed (its words need no shell quoting here).
    const hint = /arcsift: continue with: arcsift (.*)\n/.exec(run.stderr());
    expect(hint).not.toBeNull();
    const resumed = arcsift(hint![1].split(' '));
    expect(resumed.status, resumed.stderr).toBe(0);
    const summaryOf = (folder: string): { bayesFactor: { lnBayesFactor: number } } => JSON.parse(readFileSync(join(folder, 'summary.json'), 'utf8'));
    expect(summaryOf(out).bayesFactor.lnBayesFactor).toBe(summaryOf(join(root, 'compare-whole')).bayesFactor.lnBayesFactor);
    for (const model of ['smooth', 'perturbed']) {
      expect(readFileSync(join(out, model, 'posterior-weighted.csv'), 'utf8')).toBe(readFileSync(join(root, 'compare-whole', model, 'posterior-weighted.csv'), 'utf8'));
    }
    expect(leftovers(out)).toEqual([]);
  }, 300_000);
});

describe('the ensemble sampler under --checkpoint-seconds and SIGINT', () => {
  it('checkpoints by the clock, stops on SIGINT with a last checkpoint, and resumes bit-identically', async () => {
    const ensemble = (out: string): string[] => [
      'fit', '--config', config, '--data', data, '--out', out, '--perturbers', '0', '--sampler', 'ensemble', '--start-at-values',
      '--walkers', '12', '--max-sweeps', '4000', '--threads', '1', '--seed', '4', '--quiet', '--no-report', '--checkpoint-seconds', '0.2',
    ];
    const whole = arcsift(ensemble(join(root, 'ensemble-whole')));
    // 4000 sweeps (about 5 s of CPU) do not meet the stop rule: cut short by design. The run must
    // outlast three clock checkpoints and the signal on a loaded machine; 600 sweeps (1 s) did not.
    expect(whole.status, whole.stderr).toBe(3);

    const out = join(root, 'ensemble-stopped');
    const run = start(ensemble(out));
    const seen = new Set<number>();
    const file = join(out, 'checkpoint.json');
    await until(() => {
      try {
        seen.add(JSON.parse(readFileSync(file, 'utf8')).sweep as number);
      } catch {
        // Not written yet.
      }
      return seen.size >= 3;
    });
    // Written by the clock, not every 100 sweeps as before.
    expect([...seen].some((sweep) => sweep % 100 !== 0)).toBe(true);
    run.child.kill('SIGINT');
    expect(await run.exited).toBe(4);
    expect(run.stderr()).toContain('arcsift: SIGINT received');
    const stoppedAt = JSON.parse(readFileSync(file, 'utf8')).sweep as number;
    expect(stoppedAt).toBeLessThan(4000);
    const resumed = arcsift([...ensemble(out), '--resume']);
    expect(resumed.status, resumed.stderr).toBe(3);
    expect(readFileSync(join(out, 'walker-paths.csv'), 'utf8')).toBe(readFileSync(join(root, 'ensemble-whole', 'walker-paths.csv'), 'utf8'));
    expect(leftovers(out)).toEqual([]);
  }, 300_000);
});
