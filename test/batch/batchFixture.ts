import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';

// A small batch shared by the local and the Slurm tests: three rows on the small test lens
// (test/fixtures/inference/small-lens.yaml), each with its own simulated data: a smooth fit, a
// comparison (the long row, the one the tests interrupt) and a fit with the perturber. Runs are
// kept to seconds by few live points and an evaluation cap, with checkpoints every 0.3 s so that
// an interruption finds one to resume from.

export const cliPath = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
export const smallLens = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

/** Options of every row's command (after `--`). */
export const JOB_OPTIONS = ['--live-points', '20', '--max-evaluations', '8000', '--checkpoint-seconds', '0.3'];
/** The row the tests interrupt, and the file that shows it has started writing checkpoints. */
export const LONG_ROW = 'compare-b';
export const LONG_ROW_CHECKPOINT = join('smooth', 'checkpoint.json');

export interface BatchFixture {
  readonly root: string;
  readonly manifest: string;
}

/** Simulates the three data sets and writes the manifest (CSV, data paths relative to it). */
export function makeBatchFixture(prefix: string): BatchFixture {
  const root = mkdtempSync(join(tmpdir(), prefix));
  const config = loadConfig(smallLens);
  for (const seed of [1, 2, 3]) simulateToFolder(config, join(root, `data-${seed}`), { seed, noiseless: false });
  const manifest = join(root, 'lenses.csv');
  writeFileSync(manifest, [
    '# three lenses of the small test config',
    'id,job,config,data,options',
    `smooth-a,fit,${smallLens},data-1,--perturbers 0`,
    `${LONG_ROW},compare,${smallLens},data-2,`,
    `fit-c,fit,${smallLens},data-3,"--perturbers 1"`,
    '',
  ].join('\n'));
  return { root, manifest };
}

/** Runs `arcsift ARGS` to its end. */
export function arcsift(args: readonly string[], env: NodeJS.ProcessEnv = process.env): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [cliPath, ...args], { encoding: 'utf8', timeout: 120_000, env });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The arguments of `batch run` for the fixture, local unless more are given. */
export function batchRunArgs(fixture: BatchFixture, out: string, extra: readonly string[] = []): string[] {
  return ['batch', 'run', fixture.manifest, '--out', out, '--quiet', ...extra, '--', ...JOB_OPTIONS];
}

/** Waits until `file` exists; rejects after `timeoutMs`. */
export async function waitForFile(file: string, timeoutMs: number): Promise<void> {
  for (const deadline = Date.now() + timeoutMs; !existsSync(file);) {
    if (Date.now() > deadline) throw new Error(`${file} did not appear within ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

/** What must be identical between an interrupted-and-resumed row and an uninterrupted one. */
export function rowResults(out: string, id: string): { evidences: number[]; samples: string[] } {
  const folder = join(out, 'rows', id);
  const summary = JSON.parse(readFileSync(join(folder, 'summary.json'), 'utf8'));
  if (summary.kind === 'comparison') {
    return {
      evidences: [summary.models.smooth.lnEvidence, summary.models.perturbed.lnEvidence, summary.bayesFactor.lnBayesFactor],
      samples: ['smooth', 'perturbed'].map((m) => readFileSync(join(folder, m, 'posterior-weighted.csv'), 'utf8')),
    };
  }
  return { evidences: [summary.evidence.lnEvidence], samples: [readFileSync(join(folder, 'posterior-weighted.csv'), 'utf8')] };
}

/** Starts `arcsift ARGS` in a process group of its own, so that the whole group can be killed like a node going down. */
export function startGroup(args: readonly string[]): ReturnType<typeof spawn> {
  return spawn(process.execPath, [cliPath, ...args], { detached: true, stdio: 'ignore' });
}
