import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadObservedData } from '../data/loadObservedData.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { nelderMead } from '../numeric/optimisation/nelderMead.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { benchOption } from './benchOptions.js';
import { setBestStrength, stepOf } from './pixelMassProfile.js';
import { pixelatedDemoConfig } from './pixelatedDemoConfig.js';

/** Offsets of the second start from the truth: along the ellipticity-shear direction and the subhalo's mass and y. */
const SECOND_START: Readonly<Record<string, number>> = {
  'lens.mass[0].axisRatio': -0.015,
  'lens.shear.shearStrength': 0.003,
  'lens.shear.shearAngleDeg': -3,
  'perturbers[0].log10MassSolar': -0.3,
  'perturbers[0].centerYArcsec': 0.15,
};

/** The maximum of f (to be maximised) over the entries `varied` of `start`: Nelder-Mead, three rounds. */
function maximise(f: (point: Float64Array) => number, start: Float64Array, varied: number[], steps: number[]): { value: number; point: Float64Array; evaluations: number } {
  const point = Float64Array.from(start);
  const objective = (x: Float64Array): number => {
    varied.forEach((i, k) => (point[i] = x[k]));
    const value = f(point);
    return Number.isFinite(value) ? -value : Number.POSITIVE_INFINITY;
  };
  let result = nelderMead(objective, varied.map((i) => start[i]), { step: steps, valueTolerance: 0.01, pointTolerance: 1e-5, maxEvaluations: 1500 });
  let evaluations = result.evaluations;
  for (const shrink of [3, 10]) {
    result = nelderMead(objective, result.point, { step: steps.map((s) => s / shrink), valueTolerance: 0.01, pointTolerance: 1e-5, maxEvaluations: 800 });
    evaluations += result.evaluations;
  }
  const best = Float64Array.from(start);
  varied.forEach((i, k) => (best[i] = result.point[k]));
  return { value: -result.value, point: best, evaluations };
}

/**
 * `npm run bench -- pixelMeshChoice [--meshes 1000:0,2000:0,600:0.9]`: how the adaptive mesh
 * (cells:brightShare, or cells:brightShare:raysPerPixelSide to change the rays as well; the
 * config's 2 otherwise) of the pixelated demo's perturbed model moves the lens and the subhalo,
 * and which mesh the data prefer. On the mock of configs/demo-pixelated.yaml (seed 1), per mesh: the
 * maximum of ln L (the source marginalised, as the samplers see it) over every free parameter
 * (Nelder-Mead in three rounds, from the truth and from a start off it along the
 * ellipticity-shear direction, the better kept) and the parameters there; and the maximum with
 * the smooth lens held at its truth. A maximum far above the held one means the mesh biases the
 * lens; between meshes, the higher maximum is the better description of the data (the
 * evidences differ by about as much, the parameters' prior volume being the same). A few
 * minutes per mesh on one thread.
 */
export async function run(args: string[]): Promise<void> {
  const meshes = (benchOption(args, '--meshes') ?? '1000:0,2000:0,600:0.9').split(',').map((text) => {
    const fields = text.split(':').map(Number);
    const [cells, share] = fields;
    const rays = fields.length > 2 ? fields[2] : undefined;
    const raysFit = rays === undefined || (Number.isInteger(rays) && rays >= 1);
    if (fields.length > 3 || !Number.isInteger(cells) || cells < 16 || !(share >= 0 && share <= 0.95) || !raysFit) {
      throw new Error(`--meshes: expected cells:share or cells:share:rays such as 600:0.9 or 600:0.9:1, found ${text}`);
    }
    return { mesh: { cells, brightShare: share }, rays };
  });
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-'));
  try {
    simulateToFolder(pixelatedDemoConfig((light) => light), folder, { seed: 1, noiseless: false });
    for (const { mesh, rays } of meshes) {
      const config = pixelatedDemoConfig((light) => light.map((c) => (c.kind === 'pixelated'
        ? { ...c, mesh: { kind: 'adaptive', ...mesh }, ...(rays === undefined ? {} : { raysPerPixelSide: rays }) }
        : c)));
      const { observation } = config;
      const data = loadObservedData({ folder }, { columns: observation.columns, rows: observation.rows, pixelScaleArcsec: observation.pixelScaleArcsec });
      const likelihood = new PixelLikelihood(config, data, 1);
      const parameters = likelihood.system.parameters;
      const names = parameters.map((p) => p.name);
      const truth = Float64Array.from(likelihood.system.configuredValues());
      const strength = names.findIndex((n) => /RegularisationStrength$/.test(n));
      if (strength < 0) throw new Error('pixelMeshChoice: the pixelated demo config has no single regularisation strength');
      // The strength at its best with everything else at the truth, as the start.
      setBestStrength(likelihood, truth, strength);
      const varied = parameters.map((p, i) => (p.prior !== undefined ? i : -1)).filter((i) => i >= 0);
      const steps = varied.map((i) => stepOf(names[i], truth[i]));
      const f = (point: Float64Array): number => likelihood.logLikelihood(point);
      const offStart = Float64Array.from(truth, (v, i) => v + (SECOND_START[names[i]] ?? 0));
      const fromTruth = maximise(f, truth, varied, steps);
      const fromOff = maximise(f, offStart, varied, steps);
      const top = fromTruth.value >= fromOff.value ? fromTruth : fromOff;
      const notLens = varied.filter((i) => !names[i].startsWith('lens.'));
      const held = maximise(f, Float64Array.from(top.point, (v, i) => (names[i].startsWith('lens.') ? truth[i] : v)), notLens, notLens.map((i) => stepOf(names[i], truth[i])));
      console.log(JSON.stringify({
        benchmark: 'pixelMeshChoice',
        mesh: { cells: likelihood.inversion?.sourceCellCount, brightShare: mesh.brightShare },
        raysPerPixelSide: likelihood.system.pixelatedSource?.settings.raysPerPixelSide,
        lnLMax: Number(top.value.toFixed(2)),
        lnLMaxOtherStart: Number(Math.min(fromTruth.value, fromOff.value).toFixed(2)),
        lnLLensAtTruth: Number(held.value.toFixed(2)),
        evaluations: fromTruth.evaluations + fromOff.evaluations + held.evaluations,
        at: Object.fromEntries(varied.map((i) => [names[i], Number(top.point[i].toPrecision(5))])),
        truth: Object.fromEntries(varied.filter((i) => i !== strength).map((i) => [names[i], truth[i]])),
      }));
    }
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
