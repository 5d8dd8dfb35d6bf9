import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { CLI, startArcsift, until } from '../support/childRun.js';

// `vet` under SIGTERM keeps arcsift's contract for long runs (README, "Interrupted runs"): every
// running fit ends its step and writes a last checkpoint, the command exits 4 and prints how to
// continue, and the printed command ends as an uninterrupted vet would (common practice of
// checkpointing samplers). Scenario: the invented test lens of test/fixtures/inference with two
// flags. The CLI runs from dist/, which `npm test` builds first.
const config = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));
const arcsift = (args: string[]) => spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8', timeout: 300_000 });
const leftovers = (folder: string): string[] => readdirSync(folder, { recursive: true }).map(String).filter((f) => f.endsWith('.tmp') || f.endsWith('.lock'));

describe('vet under SIGTERM', () => {
  let root: string;
  let data: string;
  let flags: string;
  beforeAll(() => {
    root = mkdtempSync(join(tmpdir(), 'arcsift-vet-signal-'));
    data = join(root, 'data');
    expect(arcsift(['simulate', '--config', config, '--out', data, '--seed', '3']).status).toBe(0);
    flags = join(root, 'flags.csv');
    writeFileSync(flags, 'x,y\n0.9,0.62\n-0.5,0.8\n');
  });

  it('stops every running fit with its last checkpoint, and the printed command ends as an uninterrupted vet', async () => {
    // No checkpoint is due for an hour, so every checkpoint listed is the signal's. The whole vet
    // takes about 30 s of CPU on two threads: still running when the signal comes 2.5 s in.
    const vet = (out: string): string[] => [
      'vet', '--config', config, '--data', data, '--flags', flags, '--out', out, '--live-points', '20', '--threads', '2', '--seed', '3',
      '--quiet', '--no-report', '--checkpoint-seconds', '3600',
    ];
    const whole = arcsift(vet(join(root, 'whole')));
    expect(whole.status, whole.stderr).toBe(0);

    const out = join(root, 'stopped');
    const run = startArcsift(vet(out));
    await until(() => existsSync(join(out, 'arcsift.lock')));
    await new Promise((resolve) => { setTimeout(resolve, 2500); });
    run.child.kill('SIGTERM');
    expect(await run.exited).toBe(4);
    const stderr = run.stderr();
    expect(stderr).toContain('arcsift: SIGTERM received');
    const written = /checkpoints written: (.*)\n/.exec(stderr);
    expect(written).not.toBeNull();
    const checkpoints = written![1].split(', ');
    expect(checkpoints).toContain(join(out, 'smooth', 'checkpoint.json'));
    for (const file of checkpoints) expect(existsSync(file), file).toBe(true);
    expect(existsSync(join(out, 'vet.json'))).toBe(false);
    expect(leftovers(out)).toEqual([]);

    const hint = /arcsift: continue with: arcsift (.*)\n/.exec(stderr);
    expect(hint).not.toBeNull();
    const resumed = arcsift(hint![1].split(' '));
    expect(resumed.status, resumed.stderr).toBe(0);
    expect(readFileSync(join(out, 'vet.csv'), 'utf8')).toBe(readFileSync(join(root, 'whole', 'vet.csv'), 'utf8'));
    for (const run of ['smooth', 'candidate-1', 'candidate-2']) {
      expect(readFileSync(join(out, run, 'posterior-weighted.csv'), 'utf8')).toBe(readFileSync(join(root, 'whole', run, 'posterior-weighted.csv'), 'utf8'));
    }
    expect(leftovers(out)).toEqual([]);
  }, 300_000);
});
