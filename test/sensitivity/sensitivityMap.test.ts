import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { writeReport } from '../../src/report/writeReport.js';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig, type ArcsiftConfig } from '../../src/config/arcsiftConfig.js';
import { loadObservedData, type ObservedData } from '../../src/data/index.js';
import { readFitsImage } from '../../src/fits/index.js';
import { PixelLikelihood } from '../../src/likelihood/pixelLikelihood.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';
import { compareModels } from '../../src/inference/compareModels.js';
import { PlantedPerturberStatistic } from '../../src/sensitivity/plantedPerturberStatistic.js';
import { runSensitivityToFolder } from '../../src/sensitivity/runSensitivityToFolder.js';
import { smoothBestFitFromRun, type SmoothBestFitSource } from '../../src/sensitivity/smoothBestFit.js';
import type { SensitivitySummary } from '../../src/records/sensitivitySummary.js';

// The invented scenario of test/fixtures/inference/small-lens.yaml, simulated without its
// perturber (a clean ring), and searched for a compact perturber: a point mass with a
// log10 mass prior [6, 11]. The physical expectations checked:
// - to first order a perturber changes the image by -grad(I_source) . delta_alpha (Koopmans
//   2005, "Gravitational imaging of cold dark matter substructures", MNRAS 363, 1136; title
//   checked, volume and page not), so where there is no lensed light it has no first-order
//   signal and needs more mass to be detected than on the arc;
// - a point mass's deflection is linear in its mass, so in that linear regime the residual, and
//   the part of it a smooth refit absorbs, are linear in M and Delta chi^2 grows as M^2.
const fixture = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

function pointMassConfig(base: ArcsiftConfig): ArcsiftConfig {
  const p = base.perturbers[0];
  return {
    ...base,
    perturbers: [{
      ...p,
      kind: 'pointMass',
      entries: {
        log10MassSolar: { key: `${p.key}.log10MassSolar`, value: undefined, prior: { kind: 'uniform', lower: 6, upper: 11 } },
        centerXArcsec: p.entries.centerXArcsec,
        centerYArcsec: p.entries.centerYArcsec,
      },
    }],
  };
}

describe('detection sensitivity on a clean mock ring', () => {
  const base = loadConfig(fixture);
  const config = pointMassConfig(base);
  const out = mkdtempSync(join(tmpdir(), 'arcsift-sensitivity-'));
  let data: ObservedData;
  let bestFit: SmoothBestFitSource;
  let summary: SensitivitySummary;

  beforeAll(async () => {
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-sensitivity-mock-'));
    simulateToFolder({ ...base, perturbers: [] }, folder, { seed: 5, noiseless: false });
    data = loadObservedData({ folder }, {});
    bestFit = await smoothBestFitFromRun(config, data, {
      livePoints: 30, seed: 2, method: 'auto', replacementsPerStep: 2, lnZTolerance: 0.3, threads: 2,
    });
    summary = await runSensitivityToFolder(config, data, out, { seed: 2, gridSize: 5, threads: 2, bestFit });
  }, 180_000);

  it('needs less mass on the arc than where there is no lensed light', () => {
    // Signal-to-noise of the smooth best-fit model at each grid point's pixel: on the arc above
    // 5, no lensed light below 2 (the two sets are disjoint by construction).
    const model = new PixelLikelihood(config, data, 0).modelImage(bestFit.parameters).image;
    const snr = (p: { column: number; row: number }): number => model[p.column + data.columns * p.row] / data.noise[p.column + data.columns * p.row];
    const arc = summary.points.filter((p) => snr(p) > 5).map((p) => p.log10MinimumMass as number);
    const dark = summary.points.filter((p) => snr(p) < 2).map((p) => (p.log10MinimumMass === null ? Infinity : p.log10MinimumMass));
    expect(arc.length).toBeGreaterThan(1);
    expect(dark.length).toBeGreaterThan(1);
    // Every arc point beats every dark one, by more than the bisection's 0.05 dex resolution.
    expect(Math.max(...arc) + 0.05).toBeLessThan(Math.min(...dark));
  });

  it('writes the map on the image grid (NaN outside the mask) agreeing with the table', () => {
    const map = readFitsImage(join(out, 'sensitivity.fits'));
    expect([map.nx, map.ny]).toEqual([data.columns, data.rows]);
    for (let p = 0; p < map.data.length; p++) if (data.mask[p] === 0) expect(map.data[p]).toBeNaN();
    const rows = readFileSync(join(out, 'sensitivity.csv'), 'utf8').split('\n').filter((l) => l !== '' && !l.startsWith('#')).slice(1);
    expect(rows).toHaveLength(summary.points.length);
    for (const line of rows) {
      const [, , column, row, mass] = line.split(',');
      expect(map.data[Number(column) + data.columns * Number(row)]).toBeCloseTo(Number(mass), 6);
    }
    const json = JSON.parse(readFileSync(join(out, 'sensitivity.json'), 'utf8')) as SensitivitySummary;
    expect(json.settings.deltaChiSquareThreshold).toBe(10);
    // Cumulative fractions never fall with mass.
    for (let k = 1; k < json.decades.length; k++) expect(json.decades[k].fraction).toBeGreaterThanOrEqual(json.decades[k - 1].fraction);
  });

  it('reports the map with its decade fractions and the approximation (own report contract)', () => {
    const html = readFileSync(writeReport(out), 'utf8');
    expect(html).toContain('Smallest detectable mass');
    expect(html).toContain('decade-table');
    expect(html).toContain(summary.approximation.slice(0, 40).replace(/&/g, '&amp;'));
    for (const d of summary.decades) expect(html).toContain(`${(100 * d.fraction).toFixed(1)}%`);
    expect(existsSync(join(out, 'figures', 'sensitivity.png'))).toBe(true);
  });

  it('is borne out by compare: a perturber planted 0.5 dex above the map\'s mass at its most sensitive point is detected', async () => {
    // The map promises Delta chi^2 / 2 >= 5 at its mass; 0.5 dex more gives about ten times that
    // in the linear regime (the M^2 growth tested below), far above the Occam penalty of the
    // position window and the [6, 11] mass prior, so compare must favour the perturber
    // (ln B > 1) on a noisy mock and bracket the planted mass (common practice for injection tests).
    const best = summary.points.filter((p) => p.log10MinimumMass !== null).sort((a, b) => (a.log10MinimumMass as number) - (b.log10MinimumMass as number))[0];
    const planted = (best.log10MinimumMass as number) + 0.5;
    const p = config.perturbers[0];
    const entry = (name: string, value: number, lower: number, upper: number) => ({ key: `${p.key}.${name}`, value, prior: { kind: 'uniform' as const, lower, upper } });
    const withPlanted: ArcsiftConfig = {
      ...config,
      perturbers: [{
        ...p,
        entries: {
          log10MassSolar: entry('log10MassSolar', planted, 6, 11),
          centerXArcsec: entry('centerXArcsec', best.xArcsec, best.xArcsec - 0.2, best.xArcsec + 0.2),
          centerYArcsec: entry('centerYArcsec', best.yArcsec, best.yArcsec - 0.2, best.yArcsec + 0.2),
        },
      }],
    };
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-sensitivity-injected-'));
    simulateToFolder(withPlanted, folder, { seed: 6, noiseless: false });
    const mock = loadObservedData({ folder }, {});
    const settings = { livePoints: 30, seed: 4, method: 'auto' as const, replacementsPerStep: 2, lnZTolerance: 0.3, threads: 2 };
    const comparison = await compareModels(withPlanted, mock, { smooth: settings, perturbed: settings });
    expect(comparison.lnBayesFactor).toBeGreaterThan(1);
    expect(comparison.perturberFavoured).toBe(true);
    const mass = comparison.perturbers[0].log10Mass;
    expect(planted).toBeGreaterThanOrEqual(mass.interval95.lower);
    expect(planted).toBeLessThanOrEqual(mass.interval95.upper);
  }, 180_000);

  it('grows as M^2 in the linear regime of a point mass', () => {
    const statistic = new PlantedPerturberStatistic(config, data, bestFit);
    // Masses where Delta chi^2 is 0.05 to 1: far above the refit's 1e-3 stopping tolerance,
    // small enough to be linear. 2%: room for the second-order term.
    for (const [x, y, log10Mass] of [[0.9, 0.62, 7.5], [-1.6, 0.1, 8]]) {
      const one = statistic.deltaChiSquare(x, y, log10Mass).deltaChiSquare;
      const two = statistic.deltaChiSquare(x, y, log10Mass + Math.log10(2)).deltaChiSquare;
      expect(one).toBeGreaterThan(0.02);
      expect(two / one).toBeGreaterThan(4 * 0.98);
      expect(two / one).toBeLessThan(4 * 1.02);
    }
  });
});
