import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

// `compare` states the detection threshold it used beside every Bayes factor it reads, its own
// and the counts' (README, "Reading a verdict"): short runs on the small mock of
// test/fixtures/inference/small-lens.yaml; only the statements are checked, not the evidences.
// The evaluation cap cuts the runs short, so each command ends with exit status 3 (unfinished).
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const config = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));
const run = (args: string[]) => spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', timeout: 300_000 });

describe('compare and its detection threshold', () => {
  const root = mkdtempSync(join(tmpdir(), 'arcsift-compare-threshold-'));
  const data = join(root, 'mock');
  const short = ['--data', data, '--live-points', '15', '--max-evaluations', '1500', '--threads', '1', '--quiet', '--no-report'];

  it('prints and records the claim, the misfit of both fits and a threshold set by the user', () => {
    expect(run(['simulate', '--config', config, '--out', data, '--seed', '4']).status).toBe(0);
    const out = join(root, 'pair');
    const r = run(['compare', '--config', config, ...short, '--out', out, '--detection-threshold', '7.5']);
    expect(r.status, r.stderr).toBe(3);
    expect(r.stdout).toMatch(/^ {2}smooth model {3}: chi\^2\/dof = \d\.\d{3} .*Moran's I = -?\d\.\d{4}/m);
    expect(r.stdout).toMatch(/^ {2}perturbed model: chi\^2\/dof = \d\.\d{3}/m);
    expect(r.stdout).toMatch(/^Detection: (perturber detected|no detection|not evidence of a subhalo)/m);
    expect(r.stdout).toMatch(/threshold: ln B > 7\.5, set for this run \(the published robust-detection threshold is ln B > 50\)/);
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    expect(summary.detection.thresholdLnB).toBe(7.5);
    expect(summary.detection.smoothMisfit).toBe(summary.models.smooth.misfit.alarm);
    expect(['detected', 'not-detected', 'not-evidence']).toContain(summary.detection.claim);
  }, 300_000);

  it('states the threshold for the perturber counts too', () => {
    const out = join(root, 'counts');
    const r = run(['compare', '--config', config, ...short, '--out', out, '--max-perturbers', '1']);
    expect(r.status, r.stderr).toBe(3);
    expect(r.stdout).toMatch(/ {2}detection: (\d perturber\(s\) detected|not evidence of any perturber)/);
    expect(r.stdout).toMatch(/ {2}threshold: ln B > 50 \(about 10 sigma\)/);
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    expect(summary.detection.thresholdLnB).toBe(50);
    const lnB = summary.rows[1].lnBayesFactorToPrevious;
    expect(summary.detection.detectedCount).toBe(!summary.detection.smoothMisfit && lnB > 50 ? 1 : 0);
  }, 300_000);
});
