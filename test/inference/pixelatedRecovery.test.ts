import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseConfig, type ArcsiftConfig } from '../../src/config/arcsiftConfig.js';
import { readConfigFile } from '../../src/config/readConfigFile.js';
import { loadObservedData, type ObservedData } from '../../src/data/index.js';
import { PixelLikelihood } from '../../src/likelihood/pixelLikelihood.js';
import { logSumExp } from '../../src/numeric/statistics/logSumExp.js';
import { nelderMead } from '../../src/numeric/optimisation/nelderMead.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';

// Recovery with a clumpy source (an invented scenario: test/fixtures/inference/clumpy-lens.yaml),
// the reduced version that fits the suite's time; `npm run bench -- pixelRecovery` runs the full
// `compare` on the same mocks. Reduced: the lens is held at its true values, the source's
// nuisance parameters at their best smooth fit (the regularisation strength at the maximum of
// the smooth model's evidence, as Suyu et al. 2006 choose it; the Sersic source's shape by
// Nelder-Mead), and the perturber's prior (uniform in log10 M200 on [8, 11], uniform over the
// 0.3" disc around the flag) is integrated on a grid: ln B = ln(mean over the grid of L) - ln L
// of the smooth model. The reference is the mock's truth (common practice for simulation-based
// checks): a source model that cannot follow the clumps makes a perturber look necessary where
// there is none; a flexible one must not, and must still find one that is there.
const configPath = fileURLToPath(new URL('../fixtures/inference/clumpy-lens.yaml', import.meta.url));

interface EditableConfig { source: { light: Record<string, unknown>[] }; perturbers: unknown[] }

function configWith(edit: (data: EditableConfig) => void): ArcsiftConfig {
  const data = readConfigFile(configPath) as EditableConfig;
  edit(data);
  return parseConfig(data, configPath);
}

const pixelated = configWith(() => undefined);
// The same lens fitted with one Sersic source (its shape free, started at the main component's truth).
const sersic = configWith((data) => {
  data.source.light = [...data.source.light.filter((c) => c.kind !== 'pixelated'), {
    kind: 'sersic', amplitude: 10,
    effectiveRadiusArcsec: { value: 0.2, prior: { logUniform: [0.05, 0.8] } },
    sersicIndex: { value: 1, prior: { uniform: [0.5, 4] } },
    axisRatio: { value: 0.8, prior: { uniform: [0.4, 1] } },
    positionAngleDeg: { value: 60, prior: { periodic: [0, 180] } },
    centerXArcsec: { value: 0.12, prior: { uniform: [-0.3, 0.3] } },
    centerYArcsec: { value: 0.08, prior: { uniform: [-0.3, 0.3] } },
  }];
});

function mock(config: ArcsiftConfig, seed: number): ObservedData {
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-clumpy-'));
  simulateToFolder(config, folder, { seed, noiseless: false });
  return loadObservedData({ folder }, {});
}

/** The perturber's prior on a grid: 13 masses x the grid points inside the disc (0.075" apart). */
function perturberGrid(): { mass: number; x: number; y: number }[] {
  const grid: { mass: number; x: number; y: number }[] = [];
  for (let m = 8; m <= 11 + 1e-9; m += 0.25) {
    for (let i = -4; i <= 4; i++) {
      for (let j = -4; j <= 4; j++) {
        if (Math.hypot(i, j) * 0.075 <= 0.3) grid.push({ mass: m, x: 0.85 + 0.075 * i, y: 0.6 + 0.075 * j });
      }
    }
  }
  return grid;
}

interface Reduced { readonly lnB: number; readonly massProbability: Map<number, number> }

/**
 * ln B of the reduced comparison: `smoothFit` returns the smooth model's best vector (source
 * nuisance parameters set), which the perturbed model then shares.
 */
function reducedBayesFactor(config: ArcsiftConfig, data: ObservedData, smoothFit: (like: PixelLikelihood) => Float64Array): Reduced {
  const smooth = new PixelLikelihood(config, data, 0);
  const best = smoothFit(smooth);
  const lnSmooth = smooth.logLikelihood(best);
  const perturbed = new PixelLikelihood(config, data, 1);
  const names = perturbed.system.parameters.map((p) => p.name);
  const vector = perturbed.system.configuredValues();
  smooth.system.parameters.forEach((p, k) => { vector[names.indexOf(p.name)] = best[k]; });
  const [mi, xi, yi] = ['perturbers[0].log10MassSolar', 'perturbers[0].centerXArcsec', 'perturbers[0].centerYArcsec'].map((n) => names.indexOf(n));
  const grid = perturberGrid();
  const lnL = grid.map((g) => {
    vector[mi] = g.mass;
    vector[xi] = g.x;
    vector[yi] = g.y;
    return perturbed.logLikelihood(vector);
  });
  const lnZ = logSumExp(lnL) - Math.log(grid.length);
  const massProbability = new Map<number, number>();
  grid.forEach((g, k) => massProbability.set(g.mass, (massProbability.get(g.mass) ?? 0) + Math.exp(lnL[k] - lnZ) / grid.length));
  return { lnB: lnZ - lnSmooth, massProbability };
}

/** The pixelated source's best log10 strength for the smooth model, by golden-section search on [-6, 2]. */
function bestRegularisation(like: PixelLikelihood): Float64Array {
  const v = like.system.configuredValues();
  const k = like.system.parameters.findIndex((p) => p.name.endsWith('log10RegularisationStrength'));
  const at = (x: number): number => { v[k] = x; return like.logLikelihood(v); };
  let [a, b] = [-6, 2];
  const r = (Math.sqrt(5) - 1) / 2;
  while (b - a > 1e-3) {
    const c = b - r * (b - a), d = a + r * (b - a);
    if (at(c) > at(d)) b = d; else a = c;
  }
  v[k] = 0.5 * (a + b);
  return v;
}

/** The Sersic source's best shape for the smooth model (Nelder & Mead 1965 on -ln L). */
function bestSersic(like: PixelLikelihood): Float64Array {
  const v = like.system.configuredValues();
  const free = like.system.parameters.map((p, k) => (p.name.startsWith('source.') ? k : -1)).filter((k) => k >= 0);
  const result = nelderMead((x) => {
    free.forEach((k, j) => { v[k] = x[j]; });
    return -like.logLikelihood(v);
  }, free.map((k) => v[k]), { step: free.map(() => 0.02), valueTolerance: 1e-3, pointTolerance: 1e-5, maxEvaluations: 4000 });
  free.forEach((k, j) => { v[k] = result.point[j]; });
  return v;
}

describe('a clumpy source: pixelated against Sersic (reduced comparison)', () => {
  let pixelatedAbsent: Reduced, sersicAbsent: Reduced, pixelatedPlanted: Reduced;

  beforeAll(() => {
    const absent = mock({ ...pixelated, perturbers: [] }, 12);
    pixelatedAbsent = reducedBayesFactor(pixelated, absent, bestRegularisation);
    sersicAbsent = reducedBayesFactor(sersic, absent, bestSersic);
    pixelatedPlanted = reducedBayesFactor(pixelated, mock(pixelated, 11), bestRegularisation);
  }, 300_000);

  it('shows the Sersic source inventing a perturber where the pixelated source does not', () => {
    // The numbers side by side in the failure message.
    const both = `ln B with a Sersic source ${sersicAbsent.lnB.toFixed(1)}, with a pixelated source ${pixelatedAbsent.lnB.toFixed(1)}`;
    expect(sersicAbsent.lnB, both).toBeGreaterThan(5);
    expect(pixelatedAbsent.lnB, both).toBeLessThan(1);
  });

  it('finds the planted subhalo with a pixelated source and brackets its mass', () => {
    expect(pixelatedPlanted.lnB).toBeGreaterThan(5);
    // The true log10 M200 = 10 inside the central 95% of the grid's mass posterior.
    const masses = [...pixelatedPlanted.massProbability.keys()].sort((a, b) => a - b);
    let below = 0;
    for (const m of masses) if (m < 10 - 1e-9) below += pixelatedPlanted.massProbability.get(m)!;
    const at = pixelatedPlanted.massProbability.get(10)!;
    expect(below + at).toBeGreaterThan(0.025);
    expect(below).toBeLessThan(0.975);
  });
});
