import { describe, expect, it, beforeAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readFitsImage, writeFits } from '../../src/fits/index.js';

// Bad inputs through the command line: each check of the data loader and the config reader
// must print one message naming the file (and key or pixel) and exit with status 2, before any
// sampling starts. This is arcsift's own contract (common practice for command-line tools).
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const config = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

function run(args: string[]): { status: number | null; stderr: string; stdout: string } {
  const result = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', timeout: 60_000 });
  return { status: result.status, stderr: result.stderr, stdout: result.stdout };
}

let good: string;
let scratch: string;

/** A copy of the good data folder with one FITS file rewritten by `change`. */
function broken(name: string, file: string, change: (data: Float64Array, nx: number, ny: number) => { data: Float64Array; nx: number; ny: number }): string {
  const folder = join(scratch, name);
  cpSync(good, folder, { recursive: true });
  const image = readFitsImage(join(good, file));
  const changed = change(Float64Array.from(image.data), image.nx, image.ny);
  writeFits(join(folder, file), { primary: { ...changed, cards: image.header.cards.filter((c) => /^C(DELT|RPIX|RVAL|UNIT|TYPE)/.test(c.keyword)) } });
  return folder;
}

function compare(data: string): ReturnType<typeof run> {
  // Few live points and evaluations: should a check fail to fire, the run ends at once (exit 0).
  return run(['compare', '--config', config, '--data', data, '--out', join(scratch, `out-${Math.random()}`), '--quiet', '--live-points', '10', '--max-evaluations', '50', '--no-report']);
}

describe('bad inputs through the CLI', () => {
  beforeAll(() => {
    scratch = mkdtempSync(join(tmpdir(), 'arcsift-bad-'));
    good = join(scratch, 'good');
    const made = run(['simulate', '--config', config, '--out', good]);
    expect(made.status, made.stderr).toBe(0);
  });

  it('rejects an image whose shape disagrees with the noise map', () => {
    const folder = broken('shape', 'noise.fits', (d, nx, ny) => ({ data: d.subarray(0, nx * (ny - 1)), nx, ny: ny - 1 }));
    const r = compare(folder);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/noise\.fits/);
    expect(r.stderr).toMatch(/NAXIS2/);
  });

  it('rejects an even-sized PSF', () => {
    const folder = broken('psf', 'psf.fits', (d, nx, ny) => {
      const out = new Float64Array((nx - 1) * (ny - 1));
      for (let j = 0; j < ny - 1; j++) for (let i = 0; i < nx - 1; i++) out[j * (nx - 1) + i] = d[j * nx + i];
      return { data: out, nx: nx - 1, ny: ny - 1 };
    });
    const r = compare(folder);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/psf\.fits.*odd/);
  });

  it('names a NaN pixel inside the mask', () => {
    const folder = broken('nan', 'image.fits', (d, nx, ny) => { d[19 * nx + 30] = Number.NaN; return { data: d, nx, ny }; });
    const r = compare(folder);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/image\.fits, pixel \(30, 19\)/);
  });

  it('names a pixel whose noise is not positive', () => {
    const folder = broken('noise', 'noise.fits', (d, nx, ny) => { d[10 * nx + 30] = 0; return { data: d, nx, ny }; });
    const r = compare(folder);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/noise\.fits, pixel \(30, 10\)/);
  });

  it('names the key of a broken config and writes nothing', () => {
    const bad = join(scratch, 'bad.yaml');
    writeFileSync(bad, 'observation: {columns: 48}\n');
    const out = join(scratch, 'never');
    const r = run(['simulate', '--config', bad, '--out', out]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/bad\.yaml, key observation\.rows: expected a whole number, found nothing/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
    expect(existsSync(out)).toBe(false);
  });

  it('refuses a noise key of an earlier version with the key that replaced it, and writes nothing', () => {
    const old = join(scratch, 'old-noise.yaml');
    writeFileSync(old, readFileSync(config, 'utf8').replace(/skySigma/, 'backgroundRms'));
    const out = join(scratch, 'never-simulated-old');
    const r = run(['simulate', '--config', old, '--out', out]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/old-noise\.yaml, key observation\.noise\.backgroundRms: backgroundRms is no longer read: the key is now skySigma/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
    expect(existsSync(out)).toBe(false);
  });

  it('asks simulate for the noise model a config for fitting may leave out, and writes nothing', () => {
    const bad = join(scratch, 'no-noise.yaml');
    writeFileSync(bad, readFileSync(config, 'utf8').replace(/^  noise: .*\n/m, ''));
    const out = join(scratch, 'never-simulated');
    const r = run(['simulate', '--config', bad, '--out', out]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/no-noise\.yaml, key observation\.noise: simulate needs a noise model: expected observation\.noise \{ skySigma, integrationSeconds \}, found none/);
    expect(existsSync(out)).toBe(false);
  });

    it('explains an inverted prior with the parameter name', () => {
    const bad = join(scratch, 'inverted.yaml');
    writeFileSync(bad, readFileSync(config, 'utf8').replace('uniform: [0.9, 1.3]', 'uniform: [1.3, 0.9]'));
    const r = run(['compare', '--config', bad, '--data', good, '--out', join(scratch, 'inv'), '--quiet']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/einsteinRadiusArcsec/);
    expect(r.stderr).toMatch(/lower = 1\.3, upper = 0\.9/);
  });
});
