import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ArcsiftConfig, PsfConfig } from '../config/arcsiftConfig.js';
import { loadObservedData } from '../data/loadObservedData.js';
import { INVERSION_STAGES } from '../inversion/sourceInversion.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { benchOption } from './benchOptions.js';
import { bestMillisecondsPerCall } from './forward.js';
import { pixelatedDemoConfig } from './pixelatedDemoConfig.js';

/** The fitted source of each scenario, replacing the config's pixelated component. */
const SCENARIOS: Readonly<Record<string, Record<string, unknown>>> = {
  adaptive1000: {
    kind: 'pixelated', mesh: { kind: 'adaptive', cells: 1000 }, regularisation: 'gradient',
    log10RegularisationStrength: { value: -3, prior: { uniform: [-6, 2] } },
  },
  // The mesh of configs/demo-pixelated.yaml: 600 cells, 90% of them on the arcs' bright pixels.
  demoMesh600: {
    kind: 'pixelated', mesh: { kind: 'adaptive', cells: 600, brightShare: 0.9 }, regularisation: 'gradient',
    log10RegularisationStrength: { value: -3, prior: { uniform: [-6, 2] } },
  },
  // The demo's mesh under a PSF with power-law wings (below): every real telescope's PSF has them.
  demoMesh600Moffat: {
    kind: 'pixelated', mesh: { kind: 'adaptive', cells: 600, brightShare: 0.9 }, regularisation: 'gradient',
    log10RegularisationStrength: { value: -3, prior: { uniform: [-6, 2] } },
  },
  regular64: {
    kind: 'pixelated', mesh: { kind: 'regular', cellsPerSide: 64 }, regularisation: 'gradient',
    log10RegularisationStrength: { value: -3, prior: { uniform: [-6, 2] } },
  },
  shapelets10: {
    kind: 'shapelets', order: 10,
    centerXArcsec: { value: 0.17, prior: { uniform: [-0.4, 0.4] } },
    centerYArcsec: { value: 0.11, prior: { uniform: [-0.4, 0.4] } },
    scaleArcsec: { value: 0.1, prior: { logUniform: [0.03, 0.3] } },
  },
};

/**
 * Scenarios whose image is simulated and fitted with a PSF other than the config's Gaussian: a
 * circular Moffat profile (beta = 3, the same FWHM and 21 x 21 size). Its wings keep the whole
 * kernel inside the inversion's trimming budget, where the Gaussian's are cut, and it is not a
 * product of two 1-D factors, so the blur runs on the whole kernel.
 */
const SCENARIO_PSF: Readonly<Record<string, PsfConfig>> = {
  demoMesh600Moffat: { shape: 'moffat', fwhmArcsec: 0.1, moffatBeta: 3, sizePixels: 21 },
};

/** The config of scenario `name`: configs/demo-pixelated.yaml fitted with that source (and PSF). */
export function scenarioConfig(name: string): ArcsiftConfig {
  return withScenarioPsf(name, pixelatedDemoConfig((light) => [...light.filter((c) => c.kind !== 'pixelated'), SCENARIOS[name]]));
}

function withScenarioPsf(name: string, config: ArcsiftConfig): ArcsiftConfig {
  const psf = SCENARIO_PSF[name];
  return psf === undefined ? config : { ...config, observation: { ...config.observation, psf } };
}

/** Points cycled through by the timing: how many, and the relative step of each parameter. */
const NEARBY_POINTS = 16;
const NEARBY_STEP = 2e-4;

/**
 * NEARBY_POINTS parameter vectors around `model`: each free parameter (`free[i]`, it has a
 * prior) moved by a relative +-NEARBY_STEP in a fixed pattern, the fixed ones left alone, as a
 * sampler does. Its successive calls are at different points, and a mesh that moves changes
 * the pattern of the normal matrix, so the ordering and symbolic analysis are redone where a
 * repeated point would find them kept.
 */
function nearbyPoints(model: Float64Array, free: readonly boolean[]): Float64Array[] {
  return Array.from({ length: NEARBY_POINTS }, (_, k) => Float64Array.from(model, (v, i) => (free[i] ? v * (1 + NEARBY_STEP * (((k + i) % 4) - 1.5)) : v)));
}

/**
 * `npm run bench -- pixelSource [--only NAME]`: one thread, the whole likelihood of the smooth
 * model at the config's values on the image of configs/demo-pixelated.yaml (100 x 100 pixels,
 * annular mask, 21 x 21 PSF; a clumpy source simulated from its `simulateOnly` components, seed
 * 1), fitted with an adaptive mesh of about 1,000 cells, the demo's mesh of 600 cells (90% on the
 * arcs; also under a Moffat PSF, SCENARIO_PSF), a regular 64 x 64 grid, or shapelets of order 10. One JSON line per scenario: best
 * wall-clock and CPU milliseconds per call (of 25 repeats) over a cycle of nearby points
 * (nearbyPoints), the CPU milliseconds when the same point is repeated (`cpuMsSamePoint`, the
 * figure quoted before the cycle was introduced), the mean milliseconds of each inversion stage
 * over the cycle, the source cells, and ln L at the config's values.
 */
export async function run(args: string[]): Promise<void> {
  const only = benchOption(args, '--only');
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-'));
  try {
    // One simulated image per PSF, in a folder of its own, made when a scenario first needs it.
    const folders = new Map<string, string>();
    const imageFolder = (name: string): string => {
      const key = JSON.stringify(SCENARIO_PSF[name] ?? null);
      let imageAt = folders.get(key);
      if (imageAt === undefined) {
        imageAt = join(folder, `image${folders.size}`);
        simulateToFolder(withScenarioPsf(name, pixelatedDemoConfig((light) => light)), imageAt, { seed: 1, noiseless: false });
        folders.set(key, imageAt);
      }
      return imageAt;
    };
    for (const name of Object.keys(SCENARIOS).filter((n) => only === undefined || n === only)) {
      const config = scenarioConfig(name);
      const { observation } = config;
      const data = loadObservedData({ folder: imageFolder(name) }, { columns: observation.columns, rows: observation.rows, pixelScaleArcsec: observation.pixelScaleArcsec });
      const likelihood = new PixelLikelihood(config, data, 0);
      const model = likelihood.system.configuredValues();
      const same = bestMillisecondsPerCall(() => likelihood.logLikelihood(model));
      const points = nearbyPoints(model, likelihood.system.parameters.map((p) => p.prior !== undefined));
      let next = 0;
      const { ms, cpuMs, callsPerRepeat } = bestMillisecondsPerCall(() => {
        likelihood.logLikelihood(points[next]);
        next = (next + 1) % points.length;
      });
      const inversion = likelihood.inversion;
      let stages: Record<string, number> | undefined;
      if (inversion !== undefined) {
        const times = new Float64Array(INVERSION_STAGES.length);
        inversion.stageMilliseconds = times;
        const calls = 20;
        const started = performance.now();
        for (let k = 0; k < calls; k++) likelihood.logLikelihood(points[k % points.length]);
        const whole = (performance.now() - started) / calls;
        inversion.stageMilliseconds = null;
        stages = Object.fromEntries(INVERSION_STAGES.map((stage, k) => [stage, Number((times[k] / calls).toFixed(3))]));
        const inside = Array.from(times).reduce((a, b) => a + b, 0) / calls;
        stages.forwardAndLensLight = Number((whole - inside).toFixed(3));
      }
      console.log(JSON.stringify({
        benchmark: 'pixelSource',
        scenario: name,
        msPerCall: Number(ms.toFixed(3)),
        cpuMsPerCall: Number(cpuMs.toFixed(3)),
        oneThread: true,
        repeats: 25,
        callsPerRepeat,
        cpuMsSamePoint: Number(same.cpuMs.toFixed(3)),
        sourceCells: inversion?.sourceCellCount ?? null,
        linearAmplitudes: likelihood.system.amplitudeCount + (inversion?.sourceCellCount ?? 0),
        stagesMs: stages ?? null,
        usedPixels: data.usedPixels.length,
        lnL: Number(likelihood.logLikelihood(model).toFixed(4)),
      }));
    }
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
