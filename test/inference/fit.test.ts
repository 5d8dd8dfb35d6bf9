import { beforeAll, describe, expect, it } from 'vitest';
import { writeReport } from '../../src/report/writeReport.js';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { loadObservedData, type ObservedData } from '../../src/data/index.js';
import { InputError } from '../../src/errors.js';
import { readFitsImage } from '../../src/fits/index.js';
import { startAtConfiguredValues } from '../../src/inference/ensembleStart.js';
import { modelParameterSpace } from '../../src/model/modelParameterSpace.js';
import { readPosteriorTable } from '../../src/records/readPosteriorTable.js';
import { runFitToFolder } from '../../src/inference/runFitToFolder.js';
import { PixelLikelihood } from '../../src/likelihood/pixelLikelihood.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';
import { weightedQuantiles } from '../../src/results/index.js';
import type { EnsembleFitSummary, NestedFitSummary } from '../../src/records/fitSummary.js';

// `fit` on a mock made by `simulate` from an invented small scenario (test/fixtures/inference/
// small-lens.yaml) with its perturber removed, so the smooth model is the one that made the data.
// The reference for the posterior is the truth the mock was made from: a sound fit puts each true
// value inside the central 99.7% of its marginal posterior (common practice for simulation-based
// checks; 99.7% rather than 95% because the chain is short and its tails noisy).
const configPath = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));
const mainScript = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const config = loadConfig(configPath);
const smoothTruth = { ...config, perturbers: [] };

const summaryOf = (folder: string): { finished: boolean } => JSON.parse(readFileSync(join(folder, 'summary.json'), 'utf8'));

function arcsift(args: string[]): { status: number | null; stdout: string; stderr: string } {
  const run = spawnSync(process.execPath, [mainScript, ...args], { encoding: 'utf8', timeout: 120_000 });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

describe('startAtConfiguredValues', () => {
  const system = buildLensSystem(config, { perturberCount: 0 });
  const space = modelParameterSpace(system);
  const without = (name: string, value: number | undefined) => ({
    ...system, parameters: system.parameters.map((p) => (p.name === name ? { ...p, value } : p)),
  });

  it('centres on the config values, or on the prior median where none is given, with 1e-3 of the prior width', () => {
    const radius = 'source.light[0].effectiveRadiusArcsec';
    const start = startAtConfiguredValues(without(radius, undefined), space);
    if (!('around' in start)) throw new Error('expected a Gaussian start');
    const k = space.freeNames.indexOf(radius);
    // Median of log-uniform [0.05, 0.8] is the geometric mean sqrt(0.05 * 0.8) = 0.2 (elementary).
    expect(start.around.center[k]).toBeCloseTo(0.2, 12);
    expect(start.around.spread[k]).toBeCloseTo(1e-3 * (0.8 - 0.05), 15);
    const einstein = space.freeNames.indexOf('lens.mass[0].einsteinRadiusArcsec');
    expect(start.around.center[einstein]).toBe(1.1);
    expect(start.around.spread[einstein]).toBeCloseTo(1e-3 * (1.3 - 0.9), 15);
  });

  it('names the key of a value outside its prior', () => {
    const key = 'lens.mass[0].axisRatio';
    expect(() => startAtConfiguredValues(without(key, 1.2), space)).toThrow(InputError);
    expect(() => startAtConfiguredValues(without(key, 1.2), space)).toThrow(`key ${key}`);
  });
});

describe('runFitToFolder with the ensemble sampler', () => {
  const out = mkdtempSync(join(tmpdir(), 'arcsift-fit-'));
  const dataDir = join(out, 'data');
  const fitDir = join(out, 'ensemble');
  let data: ObservedData;
  let summary: EnsembleFitSummary;

  beforeAll(async () => {
    simulateToFolder(smoothTruth, dataDir, { seed: 7, noiseless: false });
    data = loadObservedData({ folder: dataDir }, {});
    const outcome = await runFitToFolder(config, data, fitDir, {
      sampler: 'ensemble',
      perturberCount: 0,
      ensemble: {
        seed: 3, threads: 2, maxSweeps: 400, stopRule: { minEffectiveSampleSize: 400, maxRHat: 1.01 }, proposal: 'differentialEvolution',
        // The default start: the posterior of a short nested run of the same model, made first.
        start: { nestedRun: { livePoints: 20, seed: 3, threads: 2, method: 'auto', replacementsPerStep: 1, lnZTolerance: 0.5 } },
      },
    });
    summary = outcome.summary as EnsembleFitSummary;
  }, 120_000);

  it('reports the ensemble fit: convergence table, trace plots, images and priors in one page (own report contract)', () => {
    const page = writeReport(fitDir);
    const html = readFileSync(page, 'utf8');
    expect(html).toContain('ensemble-diagnostics');
    expect(html).toContain('R-hat');
    expect(html).toContain('id="figure-trace"');
    expect(html).toContain('prior-table');
    expect(html).toContain(summary.caution.slice(0, 40));
    for (const figure of ['trace.svg', 'corner-all.svg', 'data.png', 'smooth-model.png', 'smooth-residual.png', 'smooth-normalised-residual.png']) {
      expect(existsSync(join(fitDir, 'figures', figure)), figure).toBe(true);
    }
    // Every free parameter's autocorrelation time appears in the table as the summary holds it.
    const tau = summary.model.diagnostics[0].autocorrelationTime;
    if (tau !== null) expect(html).toContain(tau.toFixed(1));
  });

  it('writes a summary with the chain diagnostics and the priors', () => {
    const written = JSON.parse(readFileSync(join(fitDir, 'summary.json'), 'utf8')) as EnsembleFitSummary;
    expect(written.kind).toBe('fit');
    expect(written.sampler).toBe('ensemble');
    expect(written.configSha256).toMatch(/^[0-9a-f]{64}$/);
    const m = written.model;
    expect(m.walkers).toBe(12); // max(4, 2 x 5 free + 2)
    expect(m.sweeps).toBe(m.converged ? m.sweeps : 400);
    expect(m.evaluations).toBeGreaterThanOrEqual(12 * (m.sweeps + 1)); // the start plus one proposal per walker per sweep
    expect(m.start).toContain('nested run of the same model made first (20 live points)');
    expect(existsSync(join(fitDir, 'nested-start', 'posterior-draws.csv'))).toBe(true);
    expect(m.stopRule).toEqual({ minEffectiveSampleSize: 400, maxRHat: 1.01 });
    expect(typeof m.converged).toBe('boolean');
    expect(m.acceptanceFraction.mean).toBeGreaterThan(0);
    expect(m.acceptanceFraction.mean).toBeLessThanOrEqual(1);
    expect(m.acceptanceFraction.min).toBeLessThanOrEqual(m.acceptanceFraction.mean);
    expect(m.diagnostics.map((d) => d.name)).toEqual(modelParameterSpace(buildLensSystem(config, { perturberCount: 0 })).freeNames);
    for (const d of m.diagnostics) {
      expect(d.autocorrelationTime, d.name).toBeGreaterThan(1);
      expect(d.rHat, d.name).toBeGreaterThan(0.9);
      expect(d.bulkEffectiveSampleSize, d.name).toBeGreaterThan(0);
      expect(d.tailEffectiveSampleSize, d.name).toBeGreaterThan(0);
    }
    // The warnings must agree with the numbers they are about.
    const mixed = (m.smallestEffectiveSampleSize ?? 0) >= 400 && (m.maxRHat ?? Infinity) <= 1.01;
    expect(m.converged).toBe(mixed);
    expect(m.warnings.some((w) => w.includes('have not mixed after 400 sweeps'))).toBe(!mixed);
    expect(m.warnings.some((w) => w.includes('R-hat above 1.01'))).toBe(!mixed && (m.maxRHat ?? Infinity) > 1.01);
    expect(written.priors.filter((p) => !p.fixed)).toHaveLength(5);
    expect(written.caution.length).toBeGreaterThan(0);
  });

  it('brackets the truth of every free smooth parameter within the central 99.7% of its posterior', () => {
    const truth = buildLensSystem(smoothTruth).configuredValues();
    const table = readPosteriorTable(join(fitDir, 'walker-paths.csv'));
    const weights = new Float64Array(table.count).fill(1);
    for (const p of summary.model.parameters) {
      const index = table.names.indexOf(p.name);
      const column = Float64Array.from({ length: table.count }, (_, r) => table.points[r * table.names.length + index]);
      const [lower, upper] = weightedQuantiles(column, weights, [0.0015, 0.9985]);
      expect(truth[index], `${p.name}: 99.7% [${lower}, ${upper}]`).toBeGreaterThanOrEqual(lower);
      expect(truth[index], `${p.name}: 99.7% [${lower}, ${upper}]`).toBeLessThanOrEqual(upper);
    }
  });

  it('writes the chain after burn-in with ln L matching the pixel likelihood', () => {
    const table = readPosteriorTable(join(fitDir, 'walker-paths.csv'));
    const m = summary.model;
    expect(table.count).toBe(m.retainedSamples);
    expect(table.count).toBe((m.storedSweeps - m.burnInSweeps / m.thin) * m.walkers);
    expect(table.names).toEqual(buildLensSystem(config, { perturberCount: 0 }).parameters.map((p) => p.name));
    const lnL = table.samplerColumns.get('lnLikelihood')!;
    expect(Math.max(...lnL)).toBe(m.bestLnLikelihood);
    // ln L = ln posterior - ln prior from the sampler must equal a direct evaluation up to the
    // rounding of that subtraction (a few ulps of |ln L| ~ 3.6e3, so 1e-9 absolute is generous).
    const likelihood = new PixelLikelihood(config, data, 0);
    const width = table.names.length;
    for (const row of [0, table.count - 1]) {
      const direct = likelihood.logLikelihood(table.points.slice(row * width, (row + 1) * width));
      expect(Math.abs(direct - lnL[row])).toBeLessThan(1e-9);
    }
    const corner = JSON.parse(readFileSync(join(fitDir, 'corner.json'), 'utf8')) as { parameters: { name: string }[]; pairs: unknown[] };
    expect(corner.parameters.map((p) => p.name)).toEqual(m.parameters.map((p) => p.name));
    expect(corner.pairs).toHaveLength(10); // 5 x 4 / 2
  });

  it('writes model and residual images that add up to the data inside the mask', () => {
    const model = readFitsImage(join(fitDir, 'best-fit-model.fits'));
    const residual = readFitsImage(join(fitDir, 'residual.fits'));
    const normalised = readFitsImage(join(fitDir, 'normalised-residual.fits'));
    expect([model.nx, model.ny]).toEqual([config.observation.columns, config.observation.rows]);
    for (let p = 0; p < model.data.length; p++) {
      if (data.mask[p] === 0) {
        expect(residual.data[p]).toBe(0);
      } else {
        // Data = model + residual to double rounding (values ~1 counts/s, so 1e-12 is ~1e4 ulps).
        expect(Math.abs(model.data[p] + residual.data[p] - data.image[p])).toBeLessThan(1e-12);
        expect(Math.abs(normalised.data[p] - residual.data[p] / data.noise[p])).toBeLessThan(1e-12);
      }
    }
  });

  it('starts a CLI ensemble run at the walker paths of a fit, and refuses those of another model', () => {
    const chain = join(fitDir, 'walker-paths.csv');
    const common = ['fit', '--config', configPath, '--data', dataDir, '--sampler', 'ensemble', '--threads', '2', '--quiet'];
    const ok = arcsift([...common, '--perturbers', '0', '--max-sweeps', '20', '--posterior-from', chain, '--out', join(out, 'restart')]);
    // 20 sweeps cannot meet the stop rule: the run is recorded as cut short (status 3).
    expect(ok.status, ok.stderr).toBe(3);
    const restarted = JSON.parse(readFileSync(join(out, 'restart', 'summary.json'), 'utf8')) as EnsembleFitSummary;
    expect(restarted.model.start).toContain('walker-paths.csv');
    const wrong = arcsift([...common, '--perturbers', '1', '--max-sweeps', '20', '--posterior-from', chain, '--out', join(out, 'wrong')]);
    expect(wrong.status).toBe(2);
    expect(wrong.stderr).toContain('another model');
    expect(existsSync(join(out, 'wrong', 'summary.json'))).toBe(false);
  });
});

describe('arcsift fit on the command line', () => {
  const out = mkdtempSync(join(tmpdir(), 'arcsift-fit-cli-'));
  const dataDir = join(out, 'data');
  beforeAll(() => {
    simulateToFolder(smoothTruth, dataDir, { seed: 8, noiseless: false });
  });

  it('exits with status 2 naming the key when --perturbers exceeds the config', () => {
    const run = arcsift(['fit', '--config', configPath, '--data', dataDir, '--perturbers', '5', '--out', join(out, 'five')]);
    expect(run.status).toBe(2);
    expect(run.stderr).toContain('key perturbers');
    expect(run.stderr).toContain('found 5');
    expect(run.stderr).not.toContain('    at '); // no stack trace
  });

  it('runs a short nested fit and writes ln Z with its priors', () => {
    const folder = join(out, 'nested');
    const run = arcsift(['fit', '--config', configPath, '--data', dataDir, '--perturbers', '0', '--live-points', '20',
      '--max-evaluations', '3000', '--threads', '2', '--quiet', '--out', folder]);
    expect(run.status, run.stderr).toBe(summaryOf(folder).finished ? 0 : 3);
    const summary = JSON.parse(readFileSync(join(folder, 'summary.json'), 'utf8')) as NestedFitSummary;
    expect(summary.kind).toBe('fit');
    expect(summary.sampler).toBe('nested');
    expect(Number.isFinite(summary.evidence.lnEvidence)).toBe(true);
    expect(summary.evidence.lnEvidenceError).toBeGreaterThan(0);
    expect(summary.priors).toHaveLength(12);
    expect(summary.priors.filter((p) => !p.fixed).map((p) => p.kind)).toEqual(['uniform', 'uniform', 'logUniform', 'uniform', 'uniform']);
    expect(summary.perturbers).toEqual([]);
    for (const file of ['posterior-weighted.csv', 'posterior-weighted.npy', 'posterior-draws.csv', 'posterior-draws.npy', 'posterior.json', 'corner.json', 'best-fit-model.fits', 'residual.fits', 'normalised-residual.fits']) {
      expect(existsSync(join(folder, file)), file).toBe(true);
    }
    expect(run.stdout).toContain('ln Z = ');
    expect(run.stdout).toContain('Priors behind this ln Z');
    expect(run.stdout).toContain('lens.mass[0].einsteinRadiusArcsec: uniform [0.9, 1.3]');
    // The report is written by default: the nested history and the evidence of the summary.
    expect(run.stdout).toContain(`report: ${join(folder, 'report.html')}`);
    const html = readFileSync(join(folder, 'report.html'), 'utf8');
    expect(html).toContain('id="figure-nested-history"');
    expect(html).toContain(summary.evidence.lnEvidence.toFixed(2));
    expect(existsSync(join(folder, 'figures', 'nested-history.svg'))).toBe(true);
    // Without --evidence the record says the nested sum gave ln Z.
    expect(summary.model.evidence?.method).toBe('nested');
  });

  it('with --evidence importance records where ln Z came from and the draws behind it', () => {
    const folder = join(out, 'importance');
    const run = arcsift(['fit', '--config', configPath, '--data', dataDir, '--perturbers', '0', '--live-points', '20',
      '--slice-steps', '1', '--evidence', 'importance', '--threads', '1', '--quiet', '--no-report', '--out', folder]);
    expect(run.status, run.stderr).toBe(0);
    const summary = JSON.parse(readFileSync(join(folder, 'summary.json'), 'utf8')) as NestedFitSummary;
    const evidence = summary.model.evidence!;
    expect(evidence.method).toBe('importance');
    expect(summary.evidence.lnEvidence).toBe(summary.model.lnEvidence);
    expect(Number.isFinite(evidence.nestedLnEvidence)).toBe(true);
    const importance = evidence.importance!;
    expect(importance.effectiveSampleSize).toBeGreaterThan(0);
    expect(importance.effectiveSampleSize).toBeLessThanOrEqual(importance.finalDraws);
    expect(importance.evaluations).toBeLessThan(summary.model.evaluations);
    expect(typeof importance.suspect).toBe('boolean');
  });

  it('takes the importance stage\'s draws and target error from the options, records them, and refuses bad ones', () => {
    const folder = join(out, 'importance-budget');
    const run = arcsift(['fit', '--config', configPath, '--data', dataDir, '--perturbers', '0', '--live-points', '20',
      '--method', 'slice', '--slice-steps', '1', '--importance-draws', '300', '--importance-error', '0.2',
      '--threads', '1', '--quiet', '--no-report', '--out', folder]);
    expect(run.status, run.stderr).toBe(0);
    const summary = JSON.parse(readFileSync(join(folder, 'summary.json'), 'utf8')) as NestedFitSummary;
    expect(summary.settings.importance).toEqual({ drawsPerStage: 300, targetLnZError: 0.2 });
    const importance = summary.model.evidence!.importance!;
    // Each adaptation stage draws 300 (draws outside the unit cube are not evaluated), the final
    // stage at least 300 (sampling/importance/runImportance.ts).
    expect(importance.finalDraws).toBeGreaterThanOrEqual(300);
    expect(importance.evaluations).toBeLessThanOrEqual(300 * (importance.stages - 1) + importance.finalDraws);
    expect(importance.evaluations).toBeLessThan(2000);
    for (const [option, value, says] of [
      ['--importance-draws', '5', /--importance-draws: expected a whole number >= 10, found 5/],
      ['--importance-draws', '50000', /--importance-draws: expected a whole number <= 40000/],
      ['--importance-error', '0', /--importance-error: expected a number > 0, found 0/],
    ] as const) {
      const refused = arcsift(['fit', '--config', configPath, '--data', dataDir, '--perturbers', '0', option, value, '--quiet', '--no-report', '--out', join(out, `refused-${value}`)]);
      expect(refused.status, refused.stderr).toBe(2);
      expect(refused.stderr).toMatch(says);
      expect(existsSync(join(out, `refused-${value}`, 'summary.json'))).toBe(false);
    }
  });
});
