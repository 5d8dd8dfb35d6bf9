import { describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { killAfterFile } from '../support/killAfterFile.js';

// A killed comparison resumes from its checkpoints and, with the same seed, ends with the same
// evidences as an uninterrupted run; the killed run leaves no summary and no half-written file
// (arcsift's own contract for long runs: common practice of checkpointing samplers).
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const config = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

function listFiles(folder: string): string[] {
  return readdirSync(folder, { recursive: true }).map(String);
}

describe('interrupted compare', () => {
  it('resumes after a kill and matches an uninterrupted run', async () => {
    const root = mkdtempSync(join(tmpdir(), 'arcsift-resume-'));
    const data = join(root, 'data');
    expect(spawnSync(process.execPath, [cli, 'simulate', '--config', config, '--out', data, '--seed', '4']).status).toBe(0);
    const common = ['compare', '--config', config, '--data', data, '--live-points', '20', '--seed', '9', '--threads', '1',
      '--checkpoint-seconds', '0.5', '--quiet', '--no-report'];

    const whole = spawnSync(process.execPath, [cli, ...common, '--out', join(root, 'whole')], { encoding: 'utf8', timeout: 300_000 });
    expect(whole.status, whole.stderr).toBe(0);

    const out = join(root, 'killed');
    const child = spawn(process.execPath, [cli, ...common, '--out', out], { stdio: 'ignore' });
    await killAfterFile(child, join(out, 'smooth', 'checkpoint.json'), 700);
    expect(existsSync(join(out, 'summary.json'))).toBe(false);
    expect(listFiles(out).filter((f) => f.endsWith('.tmp'))).toEqual([]);

    const refused = spawnSync(process.execPath, [cli, ...common, '--out', out], { encoding: 'utf8' });
    expect(refused.status).toBe(2);
    expect(refused.stderr).toMatch(/interrupted run; pass --resume/);

    const resumed = spawnSync(process.execPath, [cli, ...common, '--out', out, '--resume'], { encoding: 'utf8', timeout: 300_000 });
    expect(resumed.status, resumed.stderr).toBe(0);
    const a = JSON.parse(readFileSync(join(root, 'whole', 'summary.json'), 'utf8'));
    const b = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    expect(b.models.smooth.lnEvidence).toBe(a.models.smooth.lnEvidence);
    expect(b.models.perturbed.lnEvidence).toBe(a.models.perturbed.lnEvidence);
    expect(b.bayesFactor.lnBayesFactor).toBe(a.bayesFactor.lnBayesFactor);
    expect(readFileSync(join(out, 'perturbed', 'posterior-weighted.csv'), 'utf8')).toBe(readFileSync(join(root, 'whole', 'perturbed', 'posterior-weighted.csv'), 'utf8'));
  }, 400_000);
});
