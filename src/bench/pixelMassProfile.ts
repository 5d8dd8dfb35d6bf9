import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { loadObservedData } from '../data/loadObservedData.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { nelderMead } from '../numeric/optimisation/nelderMead.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { benchOption } from './benchOptions.js';
import { PIXELATED_DEMO_CONFIG, pixelatedDemoConfig } from './pixelatedDemoConfig.js';

/**
 * configs/demo-pixelated.yaml with its pixelated source regularised in form `form`, its adaptive
 * mesh's keys replaced by those of `mesh`.
 */
function formConfig(form: string, mesh: Record<string, number> = {}): ArcsiftConfig {
  return pixelatedDemoConfig((light) => light.map((c) => (c.kind === 'pixelated'
    ? { ...c, regularisation: form, mesh: { ...(c.mesh as Record<string, unknown>), ...mesh } }
    : c)));
}

/** A whole or fractional number option of the bench, or undefined when absent. */
function numberOption(args: string[], name: string, check: (v: number) => boolean, expected: string): number | undefined {
  const text = benchOption(args, name);
  if (text === undefined) return undefined;
  const value = Number(text);
  if (!check(value)) throw new Error(`${name}: expected ${expected}, found ${text}`);
  return value;
}

const MASS = 'perturbers[0].log10MassSolar';
const STRENGTH = /RegularisationStrength$/;

/** Sets point[strength] to the log10 lambda of the highest ln L with the rest of `point` held (a grid of 0.25 dex over [-6, 2]). */
export function setBestStrength(likelihood: PixelLikelihood, point: Float64Array, strength: number): void {
  let best = Number.NEGATIVE_INFINITY;
  let at = point[strength];
  const trial = Float64Array.from(point);
  for (let l = -6; l <= 2; l += 0.25) {
    trial[strength] = l;
    const value = likelihood.logLikelihood(trial);
    if (value > best) { best = value; at = l; }
  }
  point[strength] = at;
}

/** Nelder-Mead simplex steps: 0.3 dex for a strength, 0.03" for a perturber's centre, else 0.5% of the value (at least 1e-3). */
export function stepOf(name: string, value: number): number {
  if (STRENGTH.test(name)) return 0.3;
  if (name.startsWith('perturbers[0].center')) return 0.03;
  return Math.max(1e-3, 0.005 * Math.abs(value));
}

/**
 * `npm run bench -- pixelMassProfile [--forms gradient,curvature] [--masses 6,8.4,8.7,9,9.3]
 * [--free-position] [--cells N] [--bright-share S]`: where the likelihood of the pixelated demo puts its subhalo's mass, apart
 * from any sampler. On the mock of configs/demo-pixelated.yaml (seed 1; the truth has log10 M200
 * = 9.0), for each regularisation form and each fixed mass: ln L (the source marginalised, as the
 * samplers see it) with every other parameter at the truth and log10 lambda at its best there,
 * and its profile, the maximum over the lens's free parameters and log10 lambda (Nelder-Mead,
 * three rounds), with the perturber's centre held at the truth unless --free-position, on the
 * config's adaptive mesh or with its `cells` and `brightShare` replaced. A profile
 * that peaks away from the truth shows a bias of the model (the source and the smooth lens
 * taking up part of the subhalo's distortion) that more live points cannot remove. One JSON line
 * per form and mass, then one per form with the mass of the highest profile. About five minutes
 * per form on one thread.
 */
export async function run(args: string[]): Promise<void> {
  const forms = (benchOption(args, '--forms') ?? 'gradient,curvature').split(',');
  const masses = (benchOption(args, '--masses') ?? '6,8.4,8.7,9,9.3').split(',').map(Number);
  if (masses.some((m) => !Number.isFinite(m))) throw new Error(`--masses: expected numbers separated by commas, found ${benchOption(args, '--masses')}`);
  const freePosition = args.includes('--free-position');
  const cells = numberOption(args, '--cells', (v) => Number.isInteger(v) && v >= 16, 'a whole number of at least 16');
  const brightShare = numberOption(args, '--bright-share', (v) => v >= 0 && v <= 0.95, 'a number from 0 to 0.95');
  const mesh = { ...(cells === undefined ? {} : { cells }), ...(brightShare === undefined ? {} : { brightShare }) };
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-'));
  try {
    simulateToFolder(formConfig('gradient'), folder, { seed: 1, noiseless: false });
    for (const form of forms) {
      const config = formConfig(form, mesh);
      const { observation } = config;
      const data = loadObservedData({ folder }, { columns: observation.columns, rows: observation.rows, pixelScaleArcsec: observation.pixelScaleArcsec });
      const likelihood = new PixelLikelihood(config, data, 1);
      const meshUsed = config.sourceLight.find((c) => c.pixelated)?.pixelated?.mesh;
      const names = likelihood.system.parameters.map((p) => p.name);
      const truth = Float64Array.from(likelihood.system.configuredValues());
      const mass = names.indexOf(MASS);
      const strength = names.findIndex((n) => STRENGTH.test(n));
      if (mass < 0 || strength < 0) throw new Error(`pixelMassProfile: ${PIXELATED_DEMO_CONFIG} has no ${MASS} or no single regularisation strength`);
      setBestStrength(likelihood, truth, strength);
      const varied = likelihood.system.parameters
        .map((p, i) => (p.prior !== undefined && i !== mass && (freePosition || !names[i].startsWith('perturbers[0].center')) ? i : -1))
        .filter((i) => i >= 0);
      const profile: { log10M: number; lnL: number }[] = [];
      for (const m of masses) {
        const start = Float64Array.from(truth);
        start[mass] = m;
        const point = Float64Array.from(start);
        const objective = (x: Float64Array): number => {
          varied.forEach((i, k) => (point[i] = x[k]));
          const value = likelihood.logLikelihood(point);
          return Number.isFinite(value) ? -value : Number.POSITIVE_INFINITY;
        };
        const steps = varied.map((i) => stepOf(names[i], truth[i]));
        // Three rounds, each restarting the simplex around the last best point with a fifth of the steps.
        let result = nelderMead(objective, varied.map((i) => start[i]), { step: steps, valueTolerance: 0.01, pointTolerance: 1e-5, maxEvaluations: 600 });
        let evaluations = result.evaluations;
        for (const shrink of [5, 25]) {
          result = nelderMead(objective, result.point, { step: steps.map((s) => s / shrink), valueTolerance: 0.01, pointTolerance: 1e-5, maxEvaluations: 400 });
          evaluations += result.evaluations;
        }
        profile.push({ log10M: m, lnL: -result.value });
        console.log(JSON.stringify({
          benchmark: 'pixelMassProfile', form, mesh: meshUsed, log10M: m, freePosition,
          lnLAtTruth: Number(likelihood.logLikelihood(start).toFixed(2)),
          lnLProfile: Number((-result.value).toFixed(2)),
          evaluations,
          lastRoundConverged: result.converged,
          at: Object.fromEntries(varied.map((i, k) => [names[i], Number(result.point[k].toFixed(4))])),
        }));
      }
      const peak = profile.reduce((a, b) => (b.lnL > a.lnL ? b : a));
      console.log(JSON.stringify({ benchmark: 'pixelMassProfile', form, mesh: meshUsed, freePosition, truthLog10M: truth[mass], profilePeakLog10M: peak.log10M, lnLProfilePeak: Number(peak.lnL.toFixed(2)) }));
    }
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
