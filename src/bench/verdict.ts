import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseVerdictConfig } from '../config/verdictConfig.js';
import { loadObservedData } from '../data/loadObservedData.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { defaultThreadCount } from '../parallel/workerPool.js';
import { runVerdictToFolder } from '../verdict/runVerdictToFolder.js';
import type { TruthFile } from '../records/truthFile.js';
import { runDefaults } from '../settings/runDefaults.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';

/**
 * The benchmark's invented lens: 40 x 40 pixels of 0.09", an isothermal ellipsoid with 1% m = 3
 * and 4 multipoles, a compact Sersic source, and a tidally truncated NFW subhalo on the arc whose
 * M200 the benchmark sets (none for the false-detection mocks). Two families: the plain
 * isothermal ellipsoid, and the same with m = 3 and 4 multipoles, the family that made the data
 * (the oracle).
 */
function scenario(log10M200: number | null): unknown {
  const free = (value: number, lower: number, upper: number) => ({ value, prior: { uniform: [lower, upper] } });
  return {
    title: 'bench verdict: multipole lens with a tidally truncated subhalo',
    observation: {
      columns: 40, rows: 40, pixelScaleArcsec: 0.09, supersampling: 1,
      psf: { shape: 'gaussian', fwhmArcsec: 0.18, sizePixels: 7 },
      noise: { skySigma: 0.002, integrationSeconds: 3000 },
      mask: { shape: 'annulus', innerRadiusArcsec: 0.5, outerRadiusArcsec: 1.7 },
    },
    redshifts: { lens: 0.5, source: 2.0 },
    lens: {
      mass: [{ kind: 'isothermalEllipsoid', einsteinRadiusArcsec: free(1.1, 0.9, 1.3), axisRatio: free(0.8, 0.6, 1.0), positionAngleDeg: 40, centerXArcsec: 0, centerYArcsec: 0 }],
      multipoles: [
        { order: 3, multipoleStrength: free(0.01, 0, 0.03), multipoleAngleDeg: { value: 25, prior: { periodic: [0, 120] } } },
        { order: 4, multipoleStrength: free(0.01, 0, 0.03), multipoleAngleDeg: { value: 40, prior: { periodic: [0, 90] } } },
      ],
    },
    source: {
      light: [{
        kind: 'sersic', amplitude: 30, effectiveRadiusArcsec: 0.1, sersicIndex: 1, axisRatio: 0.8, positionAngleDeg: 60,
        centerXArcsec: free(0.12, -0.3, 0.3), centerYArcsec: free(0.08, -0.3, 0.3),
      }],
    },
    // On the arc: the flag a screening network would raise, a disc of 0.3" around it as the prior.
    perturbers: [{
      kind: 'tidallyTruncatedNfw', log10MassSolar: { value: log10M200 ?? 9, prior: { uniform: [8, 11.5] } },
      centerXArcsec: 0.95, centerYArcsec: 0.55, positionPrior: { disc: [0.9, 0.6, 0.3] },
    }],
    smoothFamilies: [
      { name: 'isothermal ellipsoid', lens: { multipoles: [] } },
      { name: 'isothermal ellipsoid + m = 3, 4 multipoles' },
    ],
  };
}

const ORACLE = 'isothermal ellipsoid + m = 3, 4 multipoles';

const inside = (value: number, interval: { readonly lower: number; readonly upper: number }): boolean => value >= interval.lower && value <= interval.upper;

/**
 * `npm run bench -- verdict [--masses 9,9.5,10,10.5] [--seeds 2] [--live-points 30] [--threads N]
 * [--threshold 50]`: on mocks of the scenario above (each mass times each noise seed, plus as many
 * mocks without a subhalo), the robust verdict's detection rate against subhalo mass next to the
 * oracle fit's (the family that made the data, its claim alone), and the coverage of the oracle's
 * 68% and 95% intervals of log10 M200 and of the log10 total (tidally truncated) mass. One JSON line
 * per mock, then one per mass and a closing summary. Long: about two minutes per mock on two cores.
 */
export async function run(args: string[]): Promise<void> {
  const masses = (benchOption(args, '--masses') ?? '9,9.5,10,10.5').split(',').map(Number);
  if (masses.some((m) => !Number.isFinite(m))) throw new Error('--masses: expected numbers separated by commas');
  const seeds = wholeNumberOption(args, '--seeds', 2);
  const livePoints = wholeNumberOption(args, '--live-points', 30, 10);
  const threads = wholeNumberOption(args, '--threads', defaultThreadCount());
  const thresholdText = benchOption(args, '--threshold');
  const threshold = thresholdText === undefined ? runDefaults.detection.lnBayesFactorThreshold : Number(thresholdText);
  const rows: { log10M200: number | null; verdict: boolean; oracle: boolean; m200In68: boolean | null; m200In95: boolean | null; totalIn68: boolean | null; totalIn95: boolean | null }[] = [];
  const started = performance.now();
  for (const log10M200 of [null, ...masses]) {
    for (let s = 1; s <= seeds; s++) {
      const seed = 100 + s;
      const verdictConfig = parseVerdictConfig(scenario(log10M200), 'bench:verdict');
      const mock = mkdtempSync(join(tmpdir(), 'arcsift-bench-verdict-mock-'));
      const out = mkdtempSync(join(tmpdir(), 'arcsift-bench-verdict-'));
      try {
        simulateToFolder(log10M200 === null ? { ...verdictConfig.base, perturbers: [] } : verdictConfig.base, mock, { seed, noiseless: false });
        const truth = JSON.parse(readFileSync(join(mock, 'truth.json'), 'utf8')) as TruthFile;
        const mockStarted = performance.now();
        const { summary } = await runVerdictToFolder(verdictConfig, loadObservedData({ folder: mock }, {}), out, {
          detectionThresholdLnB: threshold,
          evidence: () => ({ livePoints, seed: 3, method: 'auto', replacementsPerStep: 2, lnZTolerance: 0.3, threads, sliceStepsPerParameter: 1 }),
        });
        const oracle = summary.families.find((f) => f.name === ORACLE)!;
        const perturber = oracle.perturbers[0];
        const totalTruth = truth.perturbers?.[0]?.totalMassSolar;
        const row = {
          log10M200,
          verdict: summary.verdict.verdict === 'confirmed',
          oracle: oracle.claim.claim === 'detected',
          m200In68: log10M200 === null ? null : inside(log10M200, perturber.log10Mass.interval68),
          m200In95: log10M200 === null ? null : inside(log10M200, perturber.log10Mass.interval95),
          totalIn68: totalTruth === undefined || perturber.log10TotalMass === null ? null : inside(Math.log10(totalTruth), perturber.log10TotalMass.interval68),
          totalIn95: totalTruth === undefined || perturber.log10TotalMass === null ? null : inside(Math.log10(totalTruth), perturber.log10TotalMass.interval95),
        };
        rows.push(row);
        console.log(JSON.stringify({
          benchmark: 'verdict', mock: { log10M200, seed, log10TotalMass: totalTruth === undefined ? null : Number(Math.log10(totalTruth).toFixed(3)) },
          seconds: Number(((performance.now() - mockStarted) / 1000).toFixed(0)),
          verdict: summary.verdict.verdict,
          families: summary.families.map((f) => ({
            name: f.name, lnB: Number(f.lnBayesFactor.toFixed(2)), lnBError: Number(f.lnBayesFactorError.toFixed(2)),
            smoothMisfitP: f.smooth.misfit.pValue, perturbedMisfitP: f.perturbed.misfit.pValue, claim: f.claim.claim,
            log10M200: [Number(f.perturbers[0].log10Mass.median.toFixed(2)), Number(f.perturbers[0].log10Mass.interval95.lower.toFixed(2)), Number(f.perturbers[0].log10Mass.interval95.upper.toFixed(2))],
          })),
          oracleCoverage: { m200In68: row.m200In68, m200In95: row.m200In95, totalIn68: row.totalIn68, totalIn95: row.totalIn95 },
        }));
      } finally {
        rmSync(mock, { recursive: true, force: true });
        rmSync(out, { recursive: true, force: true });
      }
    }
  }
  const rate = (list: typeof rows, key: 'verdict' | 'oracle'): string => `${list.filter((r) => r[key]).length}/${list.length}`;
  for (const log10M200 of [null, ...masses]) {
    const at = rows.filter((r) => r.log10M200 === log10M200);
    console.log(JSON.stringify({ benchmark: 'verdict', log10M200, detectionRate: { verdict: rate(at, 'verdict'), oracle: rate(at, 'oracle') } }));
  }
  const planted = rows.filter((r) => r.log10M200 !== null);
  const cover = (key: 'm200In68' | 'm200In95' | 'totalIn68' | 'totalIn95'): string => `${planted.filter((r) => r[key] === true).length}/${planted.filter((r) => r[key] !== null).length}`;
  console.log(JSON.stringify({
    benchmark: 'verdict', threshold, livePoints, threads, mocks: rows.length,
    oracleCoverage: { m200In68: cover('m200In68'), m200In95: cover('m200In95'), totalIn68: cover('totalIn68'), totalIn95: cover('totalIn95') },
    seconds: Number(((performance.now() - started) / 1000).toFixed(0)),
  }));
}
