import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

// A reduced version of `npm run demo`: the same command on the small invented test scenario
// with few live points, checking that it simulates, compares, writes its run folder and ends
// with the table of the planted subhalo against the posterior (common practice: a smoke test of
// the user's first command).
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const config = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

describe('the demo, reduced', () => {
  it('simulates, compares and reports where the planted subhalo falls', () => {
    const out = mkdtempSync(join(tmpdir(), 'arcsift-demo-'));
    const result = spawnSync(process.execPath, [cli, 'demo', '--config', config, '--out', out, '--live-points', '25', '--quiet'], {
      encoding: 'utf8', timeout: 400_000,
    });
    expect(result.status, result.stderr).toBe(0);
    expect(result.stdout).toMatch(/ln Bayes factor \(perturbed \/ smooth\) = -?\d+\.\d+ \+- \d+\.\d+/);
    expect(result.stdout).toMatch(/Priors behind this Bayes factor/);
    expect(result.stdout).toMatch(/The planted subhalo against the posterior/);
    expect(result.stdout).toMatch(/log10MassSolar\s+10\.300/);
    expect(result.stdout).toMatch(/verdict: (the planted subhalo was (DETECTED|NOT detected) \(ln B = -?\d+\.\d \+- \d+\.\d, (not )?above the detection threshold 50\)|NOT evidence of the planted subhalo: the smooth model fails the misfit test)/);
    expect(result.stdout).toMatch(/Detection: .*\n  threshold: ln B > 50 \(about 10 sigma\)/);
    expect(result.stdout).toMatch(/report \(open it in a browser\): .*report\.html/);
    expect(existsSync(join(out, 'compare', 'report.html'))).toBe(true);
    const summary = JSON.parse(readFileSync(join(out, 'compare', 'summary.json'), 'utf8'));
    expect(summary.kind).toBe('comparison');
    expect(summary.priors.perturbed.length).toBeGreaterThan(summary.priors.smooth.length);
    for (const file of ['posterior-weighted.csv', 'posterior-weighted.npy', 'posterior-draws.csv', 'posterior-draws.npy', 'posterior.json', 'corner.json', 'best-fit-model.fits', 'residual.fits', 'normalised-residual.fits']) {
      expect(existsSync(join(out, 'compare', 'perturbed', file)), file).toBe(true);
    }
  }, 420_000);
});
