import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { readRowState } from '../../src/batch/rowState.js';
import type { CalibrationSummary } from '../../src/records/calibrationSummary.js';
import { arcsift, smallLens } from '../batch/batchFixture.js';

// `arcsift calibrate` end to end on the small test lens, kept to seconds (3 draws with the
// perturber and 3 without, 20 live points, 3000 evaluations: every run is cut short, so the
// figures only have to be consistent, not calibrated): the draws are simulated from their
// truths, fitted as a batch, collected into calibration.json, and the report opens in
// Debian's chromium with every figure and no console error (as test/report/browser.test.ts).
const chromiumPath = '/usr/bin/chromium';
let root: string;
let out: string;
let first: ReturnType<typeof arcsift>;

const ARGS = (o: string): string[] => ['calibrate', '--config', smallLens, '--draws', '3', '--null-draws', '3', '--out', o, '--quiet', '--', '--live-points', '20', '--max-evaluations', '3000'];

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'arcsift-calibrate-'));
  out = join(root, 'calibration');
  first = arcsift(ARGS(out));
}, 180_000);

afterAll(() => {
  if (root !== undefined) rmSync(root, { recursive: true, force: true });
});

describe('arcsift calibrate on the small test lens', () => {
  it('simulates each draw from its truth, fits them all and collects ranks, coverage and detections', () => {
    expect(first.status, first.stderr).toBe(0);
    const draws = JSON.parse(readFileSync(join(out, 'draws.json'), 'utf8'));
    expect(draws.draws.map((d: { id: string }) => d.id)).toEqual(['draw-0001', 'null-0001', 'draw-0002', 'null-0002', 'draw-0003', 'null-0003']);
    for (const d of draws.draws) {
      const truth = JSON.parse(readFileSync(join(out, 'draws', d.id, 'truth.json'), 'utf8'));
      const simulated = new Map(truth.parameters.map((p: { name: string; value: number }) => [p.name, p.value]));
      for (const [name, value] of Object.entries(d.truth)) expect(simulated.get(name), `${d.id} ${name}`).toBe(value);
      expect(truth.perturbers.length).toBe(d.withPerturber ? 1 : 0);
      expect(truth.seed).toBe(d.noiseSeed);
    }
    const s = JSON.parse(readFileSync(join(out, 'calibration.json'), 'utf8')) as CalibrationSummary;
    expect(s.draws).toMatchObject({ planned: 6, finished: 6, withPerturber: 3, withoutPerturber: 3 });
    const byName = new Map(s.parameters.map((p) => [p.name, p]));
    expect(byName.get('lens.mass[0].einsteinRadiusArcsec')?.draws).toBe(6);
    expect(byName.get('perturbers[0].log10MassSolar')?.draws).toBe(3);
    const ranks = readFileSync(join(out, 'calibration-ranks.csv'), 'utf8').trim().split('\n');
    expect(ranks[0]).toBe('draw,parameter,truth,rank,posteriorCdf,in68,in95');
    expect(ranks).toHaveLength(1 + 6 * 5 + 3 * 3);
    const det = s.detection!;
    expect(det.falseDetection.trials).toBe(3);
    expect(det.byMass.reduce((n, b) => n + b.trials, 0)).toBe(3);
    for (const d of s.perDraw) {
      const summary = JSON.parse(readFileSync(join(out, 'batch', 'rows', d.id, 'summary.json'), 'utf8'));
      expect(d.lnBayesFactor).toBe(summary.bayesFactor.lnBayesFactor);
      // Each draw's fit records the cosmology the calibration records (the config's).
      expect(summary.cosmology).toEqual(s.cosmology);
    }
    expect(s.cosmology?.set).toBe('planck2018');
    expect(first.stdout).toMatch(/false detections on draws without a perturber: \d of 3/);
  });

  it('runs nothing again when called again, and collects the same figures', () => {
    const before = readFileSync(join(out, 'calibration-ranks.csv'), 'utf8');
    const again = arcsift(ARGS(out));
    expect(again.status, again.stderr).toBe(0);
    for (const id of ['draw-0001', 'null-0003']) expect(readRowState(join(out, 'batch'), id).attempts).toHaveLength(1);
    expect(readFileSync(join(out, 'calibration-ranks.csv'), 'utf8')).toBe(before);
    const other = arcsift(['calibrate', '--config', smallLens, '--draws', '3', '--out', out, '--seed', '2', '--collect']);
    expect(other.status).toBe(2);
    expect(other.stderr).toMatch(/with seed 1; give the same config and seed to continue it/);
  });

  it.skipIf(!existsSync(chromiumPath))('writes a report that loads in headless chromium with every figure and the table of calibration.json', async () => {
    const page = join(out, 'report.html');
    expect(existsSync(page)).toBe(true);
    const s = JSON.parse(readFileSync(join(out, 'calibration.json'), 'utf8')) as CalibrationSummary;
    const browser = await chromium.launch({ executablePath: chromiumPath, args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'] });
    try {
      const tab = await browser.newPage({ viewport: { width: 1280, height: 1800 } });
      const errors: string[] = [];
      tab.on('console', (message) => { if (message.type() === 'error') errors.push(message.text()); });
      tab.on('pageerror', (error) => errors.push(error.message));
      await tab.goto(pathToFileURL(page).href, { waitUntil: 'load' });
      expect(await tab.$$eval('figure svg', (all) => all.length)).toBe(3);
      const figureIds = await tab.$$eval('figure', (all) => all.map((f) => f.id));
      expect(figureIds).toEqual(['figure-calibration-ranks', 'figure-calibration-coverage', 'figure-calibration-detection']);
      expect(errors).toEqual([]);
      const rows = await tab.$$eval('#calibration-table tbody tr', (all) => all.map((tr) => (tr as HTMLElement).innerText));
      expect(rows).toHaveLength(s.parameters.length);
      s.parameters.forEach((p, k) => {
        expect(rows[k]).toContain(p.name);
        expect(rows[k]).toContain(`${(100 * p.coverage68.fraction!).toFixed(0)}%`);
      });
      expect(await tab.innerText('#false-detection-table')).toContain(String(s.detection!.falseDetection.successes));
      expect(await tab.innerText('body')).toContain('cosmology Planck 2018 TT,TE,EE+lowE+lensing+BAO: H0 = 67.66 km/s/Mpc, Omega_m = 0.3111, flat');
      await tab.screenshot({ path: join(root, 'calibration-report.png'), fullPage: true });
    } finally {
      await browser.close();
    }
  }, 60_000);
});
