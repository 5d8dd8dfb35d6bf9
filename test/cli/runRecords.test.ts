import { createHash } from 'node:crypto';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';

// Run records through the command line (arcsift's own contract, from the issue on trustworthy
// records): summary and checkpoint name the config, every data file by sha256, the seed and the
// version; a resume that differs in any of them is refused naming what changed; a run cut short
// is recorded as unfinished and exits with status 3; simulate keeps an existing data set. The
// hashes are checked against node:crypto's sha256 of the files' bytes (an outside computation).
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const fixture = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));
const packageVersion = (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version;

function arcsift(args: readonly string[]): { status: number | null; stdout: string; stderr: string } {
  const run = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', timeout: 120_000 });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

const sha256 = (file: string): string => createHash('sha256').update(readFileSync(file)).digest('hex');
const noStackTrace = (text: string): void => { expect(text).not.toMatch(/\n\s+at /); };
/** Every file below a folder with its size and modification time, to show nothing was rewritten. */
const snapshot = (folder: string): string[] => readdirSync(folder, { recursive: true }).map(String).sort()
  .map((name) => { const s = statSync(join(folder, name)); return `${name} ${s.size} ${s.mtimeMs}`; });

let root: string;
let config: string;
let data: string;

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'arcsift-records-'));
  config = join(root, 'lens.yaml');
  writeFileSync(config, readFileSync(fixture, 'utf8'));
  data = join(root, 'data');
  expect(arcsift(['simulate', '--config', config, '--out', data, '--seed', '3']).status).toBe(0);
});

describe('simulate', () => {
  it('refuses to overwrite a data set without --force, and leaves it as it was', () => {
    const before = snapshot(data);
    const again = arcsift(['simulate', '--config', config, '--out', data, '--seed', '4']);
    expect(again.status).toBe(2);
    expect(again.stderr).toContain(`arcsift: ${data}: already holds a data set (image.fits, noise.fits, psf.fits, mask.fits, truth.json): choose another --out, or pass --force to replace it`);
    noStackTrace(again.stderr);
    expect(snapshot(data)).toEqual(before);
    const copy = join(root, 'data-copy');
    expect(arcsift(['simulate', '--config', config, '--out', copy, '--seed', '3']).status).toBe(0);
    const forced = arcsift(['simulate', '--config', config, '--out', copy, '--seed', '5', '--force']);
    expect(forced.status, forced.stderr).toBe(0);
    expect(sha256(join(copy, 'image.fits'))).not.toBe(sha256(join(data, 'image.fits')));
  });
});

describe('a fit cut short, then resumed', () => {
  const out = (): string => join(root, 'fit');
  const fit = (extra: readonly string[], configFile = config, dataFolder = data): ReturnType<typeof arcsift> => arcsift([
    'fit', '--config', configFile, '--data', dataFolder, '--out', out(), '--perturbers', '0', '--live-points', '20',
    '--threads', '1', '--quiet', '--no-report', ...extra,
  ]);
  let first: ReturnType<typeof arcsift>;
  beforeAll(() => { first = fit(['--max-evaluations', '400', '--seed', '7']); });

  it('exits with status 3 and a warning line scripts can key on', () => {
    expect(first.status, first.stderr).toBe(3);
    expect(first.stderr).toMatch(/^arcsift: warning: unfinished run: smooth \(maxEvaluations\) stopped before converging; .*summary\.json says finished: false/m);
    expect(first.stdout).toContain('warning: the run stopped (maxEvaluations)');
  });

  it('records finished: false, the config and every data file by sha256, the seed and the version', () => {
    const summary = JSON.parse(readFileSync(join(out(), 'summary.json'), 'utf8'));
    expect(summary.finished).toBe(false);
    expect(summary.unfinishedRuns).toEqual(['smooth (maxEvaluations)']);
    expect(summary.configSha256).toBe(sha256(config));
    expect(summary.dataSha256).toEqual({
      image: sha256(join(data, 'image.fits')), noise: sha256(join(data, 'noise.fits')),
      psf: sha256(join(data, 'psf.fits')), mask: sha256(join(data, 'mask.fits')),
    });
    expect(summary.seed).toBe(7);
    expect(summary.arcsiftVersion).toBe(packageVersion);
    // No cosmology in the config: Planck 2018 (the table it comes from is tested in test/cosmology).
    expect(summary.cosmology).toMatchObject({ set: 'planck2018', hubbleConstantKmPerSecPerMpc: 67.66, matterDensity: 0.3111 });
    const checkpoint = JSON.parse(readFileSync(join(out(), 'checkpoint.json'), 'utf8'));
    expect(checkpoint.runIdentity).toMatchObject({
      arcsiftVersion: packageVersion, configSha256: sha256(config), seed: 7,
      data: { image: { sha256: sha256(join(data, 'image.fits')), hdu: null }, mask: { sha256: sha256(join(data, 'mask.fits')) } },
    });
  });

  it('refuses to start again over it without --resume', () => {
    const again = fit(['--max-evaluations', '400', '--seed', '7']);
    expect(again.status).toBe(2);
    expect(again.stderr).toContain('holds a run a limit cut short (summary.json says finished: false); pass --resume');
  });

  it('refuses a resume whose config, data or seed differ, naming the change, and writes nothing', () => {
    const before = snapshot(out());
    const widened = join(root, 'widened.yaml');
    writeFileSync(widened, readFileSync(config, 'utf8').replace('uniform: [0.9, 1.3]', 'uniform: [0.9, 1.4]'));
    const byConfig = fit(['--max-evaluations', '800', '--seed', '7', '--resume'], widened);
    expect(byConfig.status).toBe(2);
    expect(byConfig.stderr).toContain('cannot resume: the checkpoint belongs to another set-up: the config changed: lens.mass[0].einsteinRadiusArcsec.prior.uniform[1] was 1.3, is 1.4');
    noStackTrace(byConfig.stderr);

    const otherData = join(root, 'other-data');
    expect(arcsift(['simulate', '--config', config, '--out', otherData, '--seed', '9']).status).toBe(0);
    const byData = fit(['--max-evaluations', '800', '--seed', '7', '--resume'], config, otherData);
    expect(byData.status).toBe(2);
    expect(byData.stderr).toMatch(/the image file's bytes changed \(.*other-data\/image\.fits: sha256 [0-9a-f]{12}\.\.\. then, [0-9a-f]{12}\.\.\. now\)/);
    expect(byData.stderr).not.toContain('psf file'); // simulate's PSF has the same bytes for every seed

    const bySeed = fit(['--max-evaluations', '800', '--seed', '8', '--resume']);
    expect(bySeed.status).toBe(2);
    expect(bySeed.stderr).toContain('the seed was 7, is 8');
    expect(snapshot(out())).toEqual(before);
  });

  it('resumes when only the config\'s comments changed, and carries on from the checkpoint', () => {
    writeFileSync(config, `# a comment added after the run started\n${readFileSync(config, 'utf8')}`);
    const resumed = fit(['--max-evaluations', '800', '--seed', '7', '--resume']);
    expect(resumed.status, resumed.stderr).toBe(3);
    const summary = JSON.parse(readFileSync(join(out(), 'summary.json'), 'utf8'));
    expect(summary.configSha256).toBe(sha256(config));
    expect(summary.model.evaluations).toBeGreaterThanOrEqual(800);
  });
});

describe('a comparison cut short, with a named cosmology', () => {
  it('prints and records its Bayes-factor reading as not final and its cosmology, in the report too; exit status 3', () => {
    const out = join(root, 'compare');
    const wmap = join(root, 'wmap.yaml');
    writeFileSync(wmap, `cosmology: wmap9\n${readFileSync(fixture, 'utf8')}`);
    const run = arcsift(['compare', '--config', wmap, '--data', data, '--out', out, '--live-points', '20', '--threads', '1',
      '--max-evaluations', '300', '--quiet']);
    expect(run.status, run.stderr).toBe(3);
    expect(run.stdout).toMatch(/reading \(Kass & Raftery 1995\): NOT FINAL, from runs cut short before converging \(smooth \(maxEvaluations\), perturbed \(maxEvaluations\)\): /);
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    expect(summary.finished).toBe(false);
    expect(summary.bayesFactor.reading).toMatch(/^NOT FINAL, from runs cut short/);
    expect(existsSync(join(out, 'smooth', 'checkpoint.json'))).toBe(true);
    expect(summary.cosmology).toEqual({
      set: 'wmap9', name: 'WMAP nine-year WMAP+eCMB+BAO+H0', reference: 'Hinshaw et al. 2013, ApJS 208, 19, Table 4, last column',
      hubbleConstantKmPerSecPerMpc: 69.32, matterDensity: 0.2865, darkEnergyDensity: 1 - 0.2865,
    });
    expect(run.stdout).toContain('Cosmology (distances, Sigma_crit, M200): WMAP nine-year WMAP+eCMB+BAO+H0: H0 = 69.32 km/s/Mpc, Omega_m = 0.2865, flat');
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).toContain('cosmology WMAP nine-year WMAP+eCMB+BAO+H0: H0 = 69.32 km/s/Mpc, Omega_m = 0.2865, flat (Hinshaw et al. 2013, ApJS 208, 19, Table 4, last column)');
    expect(html).toContain('id="unfinished"');
  });

  it('refuses a cosmology it does not know, naming the key, before anything is run', () => {
    const unknown = join(root, 'unknown-cosmology.yaml');
    writeFileSync(unknown, `cosmology: planck2015\n${readFileSync(fixture, 'utf8')}`);
    const out = join(root, 'never');
    const run = arcsift(['compare', '--config', unknown, '--data', data, '--out', out, '--live-points', '20', '--threads', '1', '--quiet']);
    expect(run.status).toBe(2);
    expect(run.stderr).toBe(`arcsift: ${unknown}, key cosmology: no such cosmology: expected one of planck2018, wmap9, or { hubbleConstant, matterDensity }, found "planck2015"\n`);
    expect(existsSync(out)).toBe(false);
  });
});
