import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeFits } from '../fits/index.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import { configHash } from '../inference/runComparisonToFolder.js';
import { gridCards } from '../simulate/simulateToFolder.js';
import { packageVersion } from '../records/packageVersion.js';
import { firstPerturber } from '../vet/perturberPositionConfig.js';
import { computeSensitivity } from './computeSensitivity.js';
import { massDecadeFractions, type MassDecadeFraction } from './massDecadeFractions.js';
import { defaultDetectionThreshold, type DetectableMassLimit } from './minimumDetectableMass.js';
import { defaultRefitSettings, PlantedPerturberStatistic, type RefitSettings } from './plantedPerturberStatistic.js';
import { nearestGridIndex, sensitivityGrid } from './sensitivityGrid.js';
import type { SmoothBestFitSource } from './smoothBestFit.js';

/** What the sensitivity map approximates, written beside every map. */
export const sensitivityApproximation =
  'Expected detection statistic on noise-free (Asimov) data: a perturber is planted in the smooth best fit, the smooth ' +
  'model is refitted locally (Nelder-Mead from the best fit, amplitudes solved linearly) and Delta chi^2 = chi^2(smooth ' +
  'refit) - chi^2(planted truth) is compared with 2 x the threshold. Approximated: the noise is not drawn (the statistic ' +
  'is its expected value, not one realisation), the refit is local (a distant better smooth solution is not sought), ' +
  'the perturber sits at the grid point with its other settings fixed, and no evidence is computed (an evidence ' +
  'threshold would also pay the Occam factor of the perturber\'s prior). The minimum mass is found by bisection in log10 ' +
  'mass, assuming Delta chi^2 grows with mass.';

export interface SensitivitySettings {
  /** n for the n x n grid over the mask's bounding box (default 10). */
  readonly gridSize: number;
  /** Detected when Delta chi^2 / 2 >= this (default 5: Delta chi^2 = 10). */
  readonly threshold?: number;
  /** Bisection stops when the bracket is narrower than this, dex (default 0.05). */
  readonly toleranceDex?: number;
  readonly refit?: RefitSettings;
  readonly threads: number;
  readonly bestFit: SmoothBestFitSource;
  readonly onPoint?: (done: number, total: number) => void;
}

/** One grid point's answer, as the CSV and JSON hold it. */
export interface SensitivityRecord {
  readonly xArcsec: number;
  readonly yArcsec: number;
  readonly column: number;
  readonly row: number;
  /** +Infinity (null in JSON) when not detectable within the mass prior. */
  readonly log10MinimumMass: number;
  readonly limit: DetectableMassLimit;
  readonly refitEvaluations: number;
}

/** sensitivity.json. */
export interface SensitivitySummary {
  readonly arcsiftVersion: string;
  readonly kind: 'sensitivity';
  readonly config: string;
  readonly configSha256: string;
  readonly data: ObservedData['files'];
  readonly perturber: { readonly key: string; readonly kind: string; readonly log10MassPriorRange: readonly [number, number] };
  readonly bestFit: { readonly from: string; readonly parameters: Record<string, number>; readonly lnLikelihood: number };
  readonly settings: {
    readonly gridSize: number; readonly threshold: number; readonly deltaChiSquareThreshold: number;
    readonly toleranceDex: number; readonly refit: RefitSettings; readonly threads: number;
  };
  readonly approximation: string;
  readonly runSeconds: number;
  readonly gridPoints: number;
  readonly decades: readonly MassDecadeFraction[];
  readonly points: readonly (Omit<SensitivityRecord, 'log10MinimumMass'> & { readonly log10MinimumMass: number | null })[];
  readonly files: Record<string, string>;
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
  const threshold = settings.threshold ?? defaultDetectionThreshold;
  const toleranceDex = settings.toleranceDex ?? 0.05;
  const refit = settings.refit ?? defaultRefitSettings;
  const grid = sensitivityGrid(data, settings.gridSize);
  const task = { config, data, bestFit: settings.bestFit, refit, threshold, toleranceDex };
  // Built here once to check the config (mass prior) before any thread starts, and for the names.
  const probe = new PlantedPerturberStatistic(config, data, settings.bestFit, refit);
  const results = await computeSensitivity(task, grid.points, settings.threads, settings.onPoint);
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
    arcsiftVersion: packageVersion(),
    kind: 'sensitivity',
    config: config.file,
    configSha256: configHash(config),
    data: data.files,
    perturber: { key: perturber.key, kind: perturber.kind, log10MassPriorRange: [lower, upper] },
    bestFit: { from: settings.bestFit.from, parameters, lnLikelihood: settings.bestFit.bestLnLikelihood },
    settings: { gridSize: grid.n, threshold, deltaChiSquareThreshold: 2 * threshold, toleranceDex, refit, threads: settings.threads },
    approximation: sensitivityApproximation,
    runSeconds: (performance.now() - started) / 1000,
    gridPoints: records.length,
    decades: massDecadeFractions(records.map((r) => r.log10MinimumMass), lower, upper),
    points: records.map((r) => ({ ...r, log10MinimumMass: Number.isFinite(r.log10MinimumMass) ? r.log10MinimumMass : null })),
    files,
  };
  writeJsonAtomic(files.summary, summary);
  return summary;
}
