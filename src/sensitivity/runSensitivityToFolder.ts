import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeFits } from '../fits/index.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import { gridCards } from '../simulate/simulateToFolder.js';
import { firstPerturber } from '../vet/perturberPositionConfig.js';
import { computeSensitivity } from './computeSensitivity.js';
import { massDecadeFractions } from './massDecadeFractions.js';
import { PlantedPerturberStatistic, refitDefaults } from './plantedPerturberStatistic.js';
import { nearestGridIndex, sensitivityGrid } from './sensitivityGrid.js';
import type { SmoothBestFitSource } from './smoothBestFit.js';
import { sensitivityApproximation } from '../records/cautions.js';
import type { DetectableMassLimit, MassDecadeFraction, RefitSettings, SensitivityRecord, SensitivitySummary } from '../records/sensitivitySummary.js';
import { runProvenance } from '../records/provenance.js';
import { unfinishedRuns } from '../records/unfinishedRuns.js';
import { runDefaults } from '../settings/runDefaults.js';

export interface SensitivitySettings {
  /** n for the n x n grid over the mask's bounding box. */
  readonly gridSize: number;
  /** Detected when Delta chi^2 / 2 >= this (default in runDefaults). */
  readonly threshold?: number;
  /** Bisection stops when the bracket is narrower than this, dex (default in runDefaults). */
  readonly toleranceDex?: number;
  readonly refit?: RefitSettings;
  readonly threads: number;
  /** Seed of the run that found the best fit (recorded; the map itself draws no random numbers). */
  readonly seed: number;
  readonly bestFit: SmoothBestFitSource;
  readonly onPoint?: (done: number, total: number) => void;
  /** A stop request: the map is abandoned between grid points (it has no checkpoint) with RunInterrupted. */
  readonly signal?: { stopRequested: boolean };
}

const cell = (v: number): string => (Number.isFinite(v) ? String(+v.toPrecision(8)) : v > 0 ? 'inf' : '');

/**
 * A detection-sensitivity map in the spirit of the sensitivity mapping of lens-modelling subhalo
 * searches (Vegetti et al. 2014): at every point of an n x n grid over the mask, the smallest
 * mass of the config's first perturber (its kind) whose planted signal the data would detect,
 * by the Asimov Delta chi^2 statistic of PlantedPerturberStatistic (see sensitivityApproximation).
 * Writes sensitivity.fits (log10 minimum mass on the image grid: each mask pixel holds its nearest
 * grid point's value, NaN outside the mask or where that point is outside it, +Infinity where not
 * detectable within the prior), sensitivity.csv and sensitivity.json (last).
 */
export async function runSensitivityToFolder(
  config: ArcsiftConfig, data: ObservedData, folder: string, settings: SensitivitySettings,
): Promise<SensitivitySummary> {
  const started = performance.now();
  const perturber = firstPerturber(config);
  const threshold = settings.threshold ?? runDefaults.sensitivity.threshold;
  const toleranceDex = settings.toleranceDex ?? runDefaults.sensitivity.toleranceDex;
  const refit = settings.refit ?? refitDefaults();
  const grid = sensitivityGrid(data, settings.gridSize);
  const task = { config, data, bestFit: settings.bestFit, refit, threshold, toleranceDex };
  // Built here once to check the config (mass prior) before any thread starts, and for the names.
  const probe = new PlantedPerturberStatistic(config, data, settings.bestFit, refit);
  const results = await computeSensitivity(task, grid.points, settings.threads, settings.onPoint, settings.signal);
  const records: SensitivityRecord[] = grid.points.map((p, k) => ({
    xArcsec: p.xArcsec, yArcsec: p.yArcsec, column: p.column, row: p.row,
    log10MinimumMass: results[k].log10Mass, limit: results[k].limit, refitEvaluations: results[k].evaluations,
  }));

  const byGridIndex = new Map<number, number>();
  grid.points.forEach((p, k) => byGridIndex.set(p.a + grid.n * p.b, records[k].log10MinimumMass));
  const map = new Float64Array(data.columns * data.rows).fill(Number.NaN);
  for (let j = 0; j < data.rows; j++) {
    for (let i = 0; i < data.columns; i++) {
      if (data.mask[i + data.columns * j] === 0) continue;
      const [a, b] = nearestGridIndex(grid, i, j);
      const value = byGridIndex.get(a + grid.n * b);
      if (value !== undefined) map[i + data.columns * j] = value;
    }
  }
  const files = {
    map: join(folder, 'sensitivity.fits'),
    table: join(folder, 'sensitivity.csv'),
    summary: join(folder, 'sensitivity.json'),
  };
  const cards = gridCards(
    { columns: data.columns, rows: data.rows, pixelScaleArcsec: data.pixelScaleArcsec }, 'log10(M/Msun)',
    `log10 minimum detectable ${perturber.kind} mass (Delta chi^2 >= ${2 * threshold}); NaN outside the mask or grid, +Inf above the prior`,
  );
  writeFits(files.map, { primary: { data: map, nx: data.columns, ny: data.rows, cards } });
  const csv = [
    `# arcsift sensitivity: log10 minimum detectable mass of the ${perturber.kind} perturber (Delta chi^2 / 2 >= ${threshold} on noise-free data); inf = not detectable within the mass prior`,
    '# limit: within, at-or-below-lower (detected at the prior\'s lowest mass), above-upper (not detected at its highest)',
    'x_arcsec,y_arcsec,column,row,log10_minimum_mass,limit',
    ...records.map((r) => [cell(r.xArcsec), cell(r.yArcsec), r.column, r.row, cell(r.log10MinimumMass), r.limit].join(',')),
  ];
  writeFileAtomic(files.table, `${csv.join('\n')}\n`);
  const [lower, upper] = probe.massPriorRange;
  const parameters: Record<string, number> = {};
  probe.smoothSpace.names.forEach((name, k) => { parameters[name] = settings.bestFit.parameters[k]; });
  const summary: SensitivitySummary = {
    kind: 'sensitivity',
    ...runProvenance(config, data, settings.seed, started, unfinishedRuns([{ label: 'smooth best fit', stopReason: settings.bestFit.stopReason }])),
    perturber: { key: perturber.key, kind: perturber.kind, log10MassPriorRange: [lower, upper] },
    bestFit: { from: settings.bestFit.from, parameters, lnLikelihood: settings.bestFit.bestLnLikelihood },
    settings: { gridSize: grid.n, threshold, deltaChiSquareThreshold: 2 * threshold, toleranceDex, refit, threads: settings.threads },
    approximation: sensitivityApproximation,
    gridPoints: records.length,
    decades: massDecadeFractions(records.map((r) => r.log10MinimumMass), lower, upper),
    points: records.map((r) => ({ ...r, log10MinimumMass: Number.isFinite(r.log10MinimumMass) ? r.log10MinimumMass : null })),
    files,
  };
  writeJsonAtomic(files.summary, summary);
  return summary;
}
