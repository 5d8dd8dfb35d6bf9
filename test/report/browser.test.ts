import { describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { writeReport } from '../../src/report/index.js';
import { SYNTHETIC, writeSyntheticRun } from './syntheticRun.js';

// The report in a real browser: Debian's chromium (installed by .ci/run), opened from disk with
// no network. Every figure must load, the console must stay free of errors, and the evidence
// table must show the numbers of summary.json. A screenshot is kept under chains/ as a CI
// artefact (chains/ is git-ignored).
const chromiumPath = '/usr/bin/chromium';
const screenshot = fileURLToPath(new URL('../../chains/report-screenshot.png', import.meta.url));

describe.skipIf(!existsSync(chromiumPath))('the report in headless chromium', () => {
  it('loads every figure without console errors and shows the evidence of summary.json', async () => {
    const run = writeSyntheticRun(mkdtempSync(join(tmpdir(), 'arcsift-browser-')));
    const page = writeReport(run);
    const summary = JSON.parse(readFileSync(join(run, 'summary.json'), 'utf8'));
    const browser = await chromium.launch({
      executablePath: chromiumPath,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
        '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    try {
      const tab = await browser.newPage({ viewport: { width: 1280, height: 1800 } });
      const errors: string[] = [];
      tab.on('console', (message) => { if (message.type() === 'error') errors.push(message.text()); });
      tab.on('pageerror', (error) => errors.push(error.message));
      const failed: string[] = [];
      tab.on('requestfailed', (request) => failed.push(request.url()));
      await tab.goto(pathToFileURL(page).href, { waitUntil: 'load' });
      const images = await tab.$$eval('img', (all) => all.map((img) => ({
        src: (img as HTMLImageElement).src, ok: (img as HTMLImageElement).complete && (img as HTMLImageElement).naturalWidth > 0,
      })));
      const svgImages = await tab.$$eval('svg image', (all) => all.length);
      expect(images.length + svgImages + (await tab.$$eval('svg', (all) => all.length))).toBeGreaterThan(3);
      for (const image of images) expect(image.ok, `figure did not load: ${image.src}`).toBe(true);
      expect(failed, `requests that failed: ${failed.join(', ')}`).toEqual([]);
      expect(errors).toEqual([]);
      const text = await tab.innerText('body');
      for (const value of [SYNTHETIC.smoothLnZ, SYNTHETIC.perturbedLnZ, SYNTHETIC.lnB]) {
        expect(text).toContain(value.toFixed(2));
      }
      expect(summary.models.smooth.lnEvidence).toBeCloseTo(SYNTHETIC.smoothLnZ, 6);
      expect(text).toContain(SYNTHETIC.caution);
      mkdirSync(join(screenshot, '..'), { recursive: true });
      await tab.screenshot({ path: screenshot, fullPage: true });
    } finally {
      await browser.close();
    }
  }, 120_000);
});
