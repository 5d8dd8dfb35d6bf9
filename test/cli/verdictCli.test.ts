import { describe, expect, it, beforeAll } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { startArcsift, until } from '../support/childRun.js';
import { killAfterFile } from '../support/killAfterFile.js';

// The verdict through the command line (README, "The robust verdict"): its help, a bad family
// stopped before any run with exit status 2 naming the key, and an interrupted verdict resumed
// run by run to the same evidences as an uninterrupted one (arcsift's own contracts for user
// mistakes and long runs; common practice of checkpointing samplers). The CLI runs from dist/.
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const fixture = fileURLToPath(new URL('../fixtures/verdict/multipole-lens.yaml', import.meta.url));

const run = (args: string[], timeout = 60_000) => spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', timeout });
const listFiles = (folder: string): string[] => readdirSync(folder, { recursive: true }).map(String);

describe('arcsift verdict', () => {
  let root: string;
  let data: string;
  beforeAll(() => {
    root = mkdtempSync(join(tmpdir(), 'arcsift-verdict-cli-'));
    data = join(root, 'mock');
    const simulated = run(['simulate', '--config', fixture, '--out', data, '--seed', '5', '--perturbers', '0']);
    expect(simulated.status, simulated.stderr).toBe(0);
  });

  it('explains the families, the rule and the threshold in --help', () => {
    const help = run(['verdict', '--help']);
    expect(help.status).toBe(0);
    expect(help.stdout).toMatch(/smoothFamilies of families, each \{ name, lens: \{ mass, shear, multipoles \}, source: \{ light \} \}/);
    expect(help.stdout).toMatch(/A family is acceptable when the model its data prefer passes the misfit\s+test/);
    expect(help.stdout).toMatch(/--detection-threshold[\s\S]*published robust-detection threshold[\s\S]*\[default: 50\]/);
    expect(help.stdout).toMatch(/--resume/);
    expect(run(['--help']).stdout).toMatch(/verdict +The robust verdict/);
  });

  it('stops on a bad family before any run, exit status 2, naming the family\'s key', () => {
    const text = readFileSync(fixture, 'utf8').replace('  - name: isothermal ellipsoid + m = 3, 4 multipoles',
      '  - name: isothermal ellipsoid + m = 3, 4 multipoles\n  - name: m = 2\n    lens:\n      multipoles:\n        - { order: 2, multipoleStrength: 0.01, multipoleAngleDeg: 0 }');
    const bad = join(root, 'bad-order.yaml');
    writeFileSync(bad, text);
    const out = join(root, 'out-bad');
    const r = run(['verdict', '--config', bad, '--data', data, '--out', out, '--quiet']);
    expect(r.stderr).toMatch(/bad-order\.yaml, key smoothFamilies\[2\]\.lens\.multipoles\[0\]\.order: a multipole needs order: 1, 3 or 4 \(smooth-model family "m = 2"\)/);
    expect(r.stderr).not.toMatch(/internal error|\n\s+at /);
    expect(r.status).toBe(2);
    expect(existsSync(out)).toBe(false);

    const unknown = join(root, 'unknown-key.yaml');
    writeFileSync(unknown, readFileSync(fixture, 'utf8').replace('    lens: { multipoles: [] }', '    lens: { multipoles: [], light: [] }'));
    const u = run(['verdict', '--config', unknown, '--data', data, '--out', join(root, 'out-unknown'), '--quiet']);
    expect(u.stderr).toMatch(/unknown-key\.yaml, key smoothFamilies\[0\]\.lens\.light: unknown key/);
    expect(u.status).toBe(2);
  });

  it('resumes an interrupted verdict and ends as an uninterrupted one', async () => {
    const common = ['verdict', '--config', fixture, '--data', data, '--live-points', '20', '--seed', '9', '--threads', '1',
      '--max-evaluations', '4000', '--checkpoint-seconds', '0.5', '--quiet', '--no-report'];
    // The evaluation cap keeps the test short and cuts every run short: the verdict is written,
    // says finished: false, and the command warns and exits with status 3 (README, exit statuses).
    const whole = run([...common, '--out', join(root, 'whole')], 300_000);
    expect(whole.status, whole.stderr).toBe(3);
    expect(whole.stderr).toMatch(/^arcsift: warning: unfinished run: isothermal ellipsoid \/ smooth \(maxEvaluations\)/m);
    expect(whole.stdout).toMatch(/^Robust verdict over 2 smooth-model families/);
    expect(JSON.parse(readFileSync(join(root, 'whole', 'verdict.json'), 'utf8')).finished).toBe(false);

    const out = join(root, 'killed');
    const child = spawn(process.execPath, [cli, ...common, '--out', out], { stdio: 'ignore' });
    const firstCheckpoint = join(out, 'families', 'isothermal-ellipsoid', 'smooth', 'checkpoint.json');
    await killAfterFile(child, firstCheckpoint, 700);
    expect(existsSync(join(out, 'verdict.json'))).toBe(false);
    expect(listFiles(out).filter((f) => f.endsWith('.tmp'))).toEqual([]);

    const refused = run([...common, '--out', out]);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toMatch(/holds an interrupted run; pass --resume/);

    const resumed = run([...common, '--out', out, '--resume'], 300_000);
    expect(resumed.status, resumed.stderr).toBe(3);
    const a = JSON.parse(readFileSync(join(root, 'whole', 'verdict.json'), 'utf8'));
    const b = JSON.parse(readFileSync(join(out, 'verdict.json'), 'utf8'));
    expect(b.families.map((f: any) => [f.smooth.lnEvidence, f.perturbed.lnEvidence])).toEqual(a.families.map((f: any) => [f.smooth.lnEvidence, f.perturbed.lnEvidence]));
    expect(b.verdict).toEqual(a.verdict);

    const again = run([...common, '--out', out]);
    expect(again.status).toBe(2);
    expect(again.stderr).toMatch(/holds a run a limit cut short \(verdict\.json says finished: false\); pass --resume/);
  }, 600_000);

  it('stops every family\'s runs on SIGTERM, each with its last checkpoint, and continues with the printed command', async () => {
    // Four runs side by side on two threads, no checkpoint due for an hour: every checkpoint
    // listed is the signal's, so each run ended before the command exited (exit status 4). No
    // evaluation limit: the whole verdict takes about 25 s on two quiet cores, so every run is
    // still going when the signal comes 2.5 s in (with a limit, a quiet machine ended them first).
    const out = join(root, 'stopped');
    const stopped = startArcsift(['verdict', '--config', fixture, '--data', data, '--out', out, '--live-points', '20', '--seed', '9',
      '--threads', '2', '--checkpoint-seconds', '3600', '--quiet', '--no-report']);
    await until(() => existsSync(join(out, 'arcsift.lock')));
    await new Promise((resolve) => { setTimeout(resolve, 2500); });
    stopped.child.kill('SIGTERM');
    expect(await stopped.exited).toBe(4);
    const stderr = stopped.stderr();
    const checkpoints = ['isothermal-ellipsoid', 'isothermal-ellipsoid-m-3-4-multipoles'].flatMap((f) => ['smooth', 'perturbed'].map((m) => join(out, 'families', f, m, 'checkpoint.json')));
    expect(stderr).toContain(`checkpoints written: ${checkpoints.join(', ')}`);
    expect(existsSync(join(out, 'verdict.json'))).toBe(false);
    expect(listFiles(out).filter((f) => f.endsWith('.tmp'))).toEqual([]);
    const hint = /arcsift: continue with: arcsift (.*)\n/.exec(stderr);
    expect(hint).not.toBeNull();
    const resumed = run(hint![1].split(' '), 300_000);
    expect(resumed.status, resumed.stderr).toBe(0);
    expect(existsSync(join(out, 'verdict.json'))).toBe(true);
  }, 300_000);
});
