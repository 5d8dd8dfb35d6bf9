import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readFitsImage, stringCard, writeFits } from '../../src/fits/index.js';
import { writeReport } from '../../src/report/writeReport.js';

// A first real lens as a new user would fit it: a pipeline-shaped file (empty primary holding
// EXPTIME; SCI in electrons, ERR, WHT; TAN WCS rotated by 30 degrees) and a PSF oversampled 3
// times, written with astropy by test/fixtures/pipeline/make_pipeline.py, fitted through the
// CLI with a config holding only what fitting uses. Sky values come from astropy
// (expected.json); exit statuses and messages are arcsift's own contract (README).
const cli = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const folder = fileURLToPath(new URL('../fixtures/pipeline/', import.meta.url));
const observation = join(folder, 'observation.fits');
const psf = join(folder, 'psf-oversampled3.fits');
const config = join(folder, 'pipeline-lens.yaml');
const expected = JSON.parse(readFileSync(join(folder, 'expected.json'), 'utf8'));
const [lensRa, lensDec] = expected.lensSky as [number, number];
const cutoutSky = `${lensRa},${lensDec},${expected.cutout.sideArcsec}`;

function run(args: readonly string[]): { status: number | null; stdout: string; stderr: string } {
  const result = spawnSync(process.execPath, [cli, ...args], { encoding: 'utf8', timeout: 60_000 });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

/** `fit` of the pipeline file with quick settings: 20 live points, 1500 evaluations, one thread (about 5 s). */
function fit(out: string, ...changes: string[]): ReturnType<typeof run> {
  const base: Record<string, string> = {
    '--config': config, '--image': `${observation}[SCI]`, '--weight': `${observation}[WHT]`, '--psf': psf, '--cutout-sky': cutoutSky,
  };
  for (let k = 0; k < changes.length; k += 2) {
    if (changes[k + 1] === '') delete base[changes[k]];
    else base[changes[k]] = changes[k + 1];
  }
  const options = Object.entries(base).flatMap(([name, value]) => [name, value]);
  return run(['fit', ...options, '--live-points', '20', '--max-evaluations', '1500', '--threads', '1', '--seed', '3', '--quiet', '--no-report', '--out', out]);
}

describe('fitting a pipeline file through the CLI', () => {
  let scratch: string;
  let result: ReturnType<typeof run>;
  let summary: any;
  beforeAll(() => {
    scratch = mkdtempSync(join(tmpdir(), 'arcsift-pipeline-'));
    result = fit(join(scratch, 'fit'));
    // The fit is cut at 1500 evaluations on purpose: a run cut short exits with status 3.
    summary = result.status === 3 ? JSON.parse(readFileSync(join(scratch, 'fit', 'summary.json'), 'utf8')) : undefined;
  });

  it('fits the cut-out of SCI with the weights and the oversampled PSF, saying what it did', () => {
    expect(result.status, result.stderr).toBe(3);
    expect(result.stderr).toMatch(/observation\.fits\[SCI\]: BUNIT 'ELECTRONS' divided by EXPTIME = 1200 s \(the primary header\)/);
    expect(result.stderr).toMatch(/cut-out of 40 x 40 pixels from \(column 14, row 12\), counted from 0/);
    expect(result.stderr).toMatch(/psf-oversampled3\.fits: the PSF is sampled 3 times finer than the image/);
    expect(result.stderr).toMatch(/mask: no mask file given or found; .*pipeline-lens\.yaml's observation\.mask \(annulus 0\.5" to 1\.5"/);
    expect(summary.data).toEqual({ image: `${observation}[SCI]`, weight: `${observation}[WHT]`, psf });
    expect(summary.cutout).toEqual({ column0: 14, row0: 12, columns: 40, rows: 40 });
    expect(summary.imageUnit).toMatch(/EXPTIME = 1200 s/);
    // The WCS of the cut-out: CRPIX of the frame (30, 28.5) less the box's corner (14, 12).
    expect(summary.wcs).toMatchObject({ projection: 'TAN', frame: 'ICRS', crpix: [16, 16.5], crvalDeg: [201.365, -43.0191] });
  });

  it('gives the source position angle east of north as astropy turns it at the lens', () => {
    // astropy's east-of-north angles of the +x and +y directions at the lens pixel (the cut-out's
    // centre); a square-pixel WCS turns every angle by the first and, unmirrored, keeps the sense.
    const at = (theta: number): number => expected.positionAngles.find((a: any) => a.column === 33.5 && a.counterClockwiseFromXDeg === theta).eastOfNorthDeg;
    const sense = Math.sign(((at(90) - at(0) + 540) % 360) - 180);
    const parameter = summary.model.parameters.find((p: any) => p.name === 'source.light[0].positionAngleDeg');
    const want = (((at(0) + sense * parameter.median) % 360) + 360) % 360;
    // 1e-7 degrees: astropy's angle carries about 1e-9 of rounding, arcsift's about as much.
    expect(Math.abs(parameter.eastOfNorthDeg.median - want)).toBeLessThan(1e-7);
    expect(parameter.eastOfNorthDeg.interval68[1] - parameter.eastOfNorthDeg.interval68[0]).toBeCloseTo(parameter.interval68[1] - parameter.interval68[0], 6);
    expect(result.stdout).toMatch(/source\.light\[0\]\.positionAngleDeg \[deg\] .* = [\d.]+ east of north/);
  });

  it('reports the perturber on the sky, inside the cut-out\'s prior box', () => {
    const sky = summary.perturbers[0].sky;
    expect(sky.frame).toBe('ICRS');
    // The position prior is |x|, |y| <= 1.2" about the lens: at most 1.2 sqrt(2) = 1.7" from it.
    const apart = Math.hypot((sky.raDeg.median - lensRa) * Math.cos((lensDec * Math.PI) / 180), sky.decDeg.median - lensDec) * 3600;
    expect(apart).toBeLessThan(1.7);
    expect(result.stdout).toMatch(/perturbers\[0\] \(truncatedNfw\) on the sky: RA 201\.36\d+ \(68% [\d.]+ to [\d.]+\), Dec -43\.01\d+ .* degrees \(ICRS\)/);
  });

  it('shows in its report the data and noise as they were fitted: cut out, in counts/s, the noise from the weights', () => {
    const out = join(scratch, 'fit');
    const page = readFileSync(writeReport(out), 'utf8');
    expect(page).not.toMatch(/not found/);
    for (const figure of ['data.svg', 'noise.svg', 'perturbed-residual.svg']) expect(existsSync(join(out, 'figures', figure))).toBe(true);
    expect(readFileSync(join(out, 'figures', 'data.svg'), 'utf8')).toMatch(/counts\/s/);
  });
});

describe('refusals of pipeline data through the CLI: exit 2, a clear message, nothing written', () => {
  let scratch: string;
  beforeAll(() => {
    scratch = mkdtempSync(join(tmpdir(), 'arcsift-pipeline-bad-'));
  });

  const jansky = (): string => {
    const sci = readFitsImage(observation, { hdu: 'SCI' });
    const path = join(scratch, 'jansky.fits');
    writeFits(path, { primary: { cards: [] }, extensions: [{ data: sci.data, nx: sci.nx, ny: sci.ny, extname: 'SCI', cards: [stringCard('BUNIT', 'Jy/beam')] }] });
    return path;
  };
  const cases: [string, () => string[], RegExp][] = [
    ['the image HDU named as the noise map too', () => ['--image', observation, '--weight', '', '--noise', observation], /noise map and image are the same HDU \(HDU 1 \(SCI\)\): name the noise map's HDU/],
    ['a unit arcsift cannot convert', () => ['--image', `${jansky()}[SCI]`, '--weight', '', '--noise', `${observation}[ERR]`, '--cutout-sky', ''], /jansky\.fits\[SCI\], key BUNIT: .*'Jy\/beam' is not a unit arcsift can turn into counts per second/],
    ['noise and weight together', () => ['--noise', `${observation}[ERR]`], /Arguments noise and weight are mutually exclusive/],
    ['an oversampling disagreeing with the PSF file', () => ['--psf-oversampling', '2'], /psf-oversampled3\.fits, key OVERSAMP: PSF oversampling disagrees: given as 2, found OVERSAMP = 3/],
    ['a cut-out leaving the frame', () => ['--cutout-sky', '', '--cutout-box', '40,30,40,40'], /cut-out outside the frame: .*found columns 40 to 79 and rows 30 to 69/],
    ['the whole frame against the config\'s 40 x 40', () => ['--cutout-sky', ''], /image shape: expected 40 x 40 pixels .* found 64 x 60; to fit part of a larger frame, ask for a cut-out/],
    ['no PSF in the data nor in the config', () => ['--psf', ''], /no PSF: expected a PSF file .* or observation\.psf in the config, found neither/],
    ['an HDU the file does not have', () => ['--weight', `${observation}[WHT,2]`], /observation\.fits\[WHT,2\]: weight file .* no HDU has EXTNAME='WHT' with EXTVER=2/],
  ];
  for (const [what, changes, message] of cases) {
    it(`refuses ${what}`, () => {
      const out = join(scratch, `out-${what.replace(/\W+/g, '-')}`);
      const r = fit(out, ...changes());
      expect(r.stderr).toMatch(message);
      expect(r.stderr).not.toMatch(/internal error|\n\s+at /);
      expect(r.status).toBe(2);
      expect(existsSync(out)).toBe(false);
    });
  }
});

describe('the command line itself', () => {
  it('prints the command list for a bare arcsift (exit 2)', () => {
    const r = run([]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/Commands:\n\s+arcsift simulate/);
    expect(r.stderr).toMatch(/arcsift vet/);
    expect(r.stderr).toMatch(/name one of the commands above/);
  });

  it('suggests the option meant by a mistyped one', () => {
    const r = run(['fit', '--confg', config, '--live-pionts', '3', '--no-reprot']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/did you mean --config \(not --confg\)\?/);
    expect(r.stderr).toMatch(/did you mean --live-points \(not --live-pionts\)\?/);
    expect(r.stderr).toMatch(/did you mean --no-report \(not --no-reprot\)\?/);
    const far = run(['fit', '--config', config, '--zzzzzz']);
    expect(far.stderr).toMatch(/Unknown argument: zzzzzz/);
    expect(far.stderr).not.toMatch(/did you mean/);
  });
});
