import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { parseConfig, type ArcsiftConfig } from '../config/arcsiftConfig.js';
import { readConfigFile } from '../config/readConfigFile.js';
import { usedPixelIndices } from '../imaging/mask.js';
import { growMaskByKernel } from '../likelihood/growMaskByKernel.js';
import { ForwardModel } from '../forward/forwardModel.js';
import { simulateObservation, type Simulation } from '../simulate/simulateObservation.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';

/** The supersampling whose brute-force image the fast model reproduces in these scenarios. */
export const BENCH_SUPERSAMPLING = 8;

const demoPath = fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url));

/** A scenario: a config to simulate and time. */
export interface ForwardScenario {
  readonly name: string;
  readonly config: ArcsiftConfig;
}

interface EditableConfig {
  observation: { supersampling: number };
  source: { light: { amplitude: number; effectiveRadiusArcsec: { value: number } }[] };
  perturbers: { centerXArcsec: number; centerYArcsec: number }[];
}

/** The demo config as plain data with `supersampling`, for editing. */
function demoData(): EditableConfig {
  const data = readConfigFile(demoPath) as EditableConfig;
  data.observation.supersampling = BENCH_SUPERSAMPLING;
  return data;
}

/**
 * The scenarios of the forward and likelihood benchmarks (and of the accuracy test):
 * - demo: configs/demo.yaml at supersampling 8;
 * - compactSource: the demo with a compact, bright source (R_e 0.05 arcsec, amplitude 400 instead
 *   of 0.16 and 40) and the subhalo moved onto the brightest arc pixel of the smooth model.
 */
export function forwardScenarios(): ForwardScenario[] {
  const demo = parseConfig(demoData(), demoPath);
  const compact = demoData();
  compact.source.light[0].effectiveRadiusArcsec.value = 0.05;
  compact.source.light[0].amplitude = 400;
  const smooth = simulateObservation({ ...parseConfig(compact, demoPath), perturbers: [] }, { seed: 1, noiseless: true });
  const brightest = brightestUsedPixel(smooth);
  const columns = smooth.grid.columns;
  const i = brightest % columns;
  const j = (brightest - i) / columns;
  compact.perturbers[0].centerXArcsec = (i - (columns - 1) / 2) * smooth.grid.pixelScaleArcsec;
  compact.perturbers[0].centerYArcsec = (j - (smooth.grid.rows - 1) / 2) * smooth.grid.pixelScaleArcsec;
  return [{ name: 'demo', config: demo }, { name: 'compactSource', config: parseConfig(compact, demoPath) }];
}

/** Row-major index of the brightest pixel of the model inside the mask. */
export function brightestUsedPixel(simulation: Simulation): number {
  let best = -1;
  for (let p = 0; p < simulation.model.length; p++) {
    if (simulation.mask[p] !== 0 && (best < 0 || simulation.model[p] > simulation.model[best])) best = p;
  }
  return best;
}

/**
 * The forward model a fit of this simulation uses: light where the PSF reaches the mask, the
 * tolerance from the noise map and the brightest data pixel in the mask.
 */
export function fitForwardModel(simulation: Simulation): ForwardModel {
  const { grid, psf, mask, image, noise } = simulation;
  const computed = growMaskByKernel(mask, grid.columns, grid.rows, psf.columns, psf.rows);
  const used = usedPixelIndices(mask);
  let peakBrightness = 0;
  for (const p of used) peakBrightness = Math.max(peakBrightness, image[p]);
  return new ForwardModel(simulation.system, grid, BENCH_SUPERSAMPLING, psf, { computed, used, noise, peakBrightness });
}

/**
 * Best, over `repeats` runs of about `targetMs` each (default 25 of 60 ms: on a shared machine
 * short runs are more often left alone by the other jobs), of the mean milliseconds per call of f:
 * wall-clock time, and this process's CPU time (user + system), which on a shared machine is
 * less inflated by waiting for a core.
 */
export function bestMillisecondsPerCall(
  f: () => void, repeats = 25, targetMs = 60,
): { ms: number; cpuMs: number; callsPerRepeat: number } {
  f();
  const start = performance.now();
  let calls = 0;
  while (performance.now() - start < 100) {
    f();
    calls++;
  }
  const callsPerRepeat = Math.max(1, Math.round((calls * targetMs) / (performance.now() - start)));
  let best = Number.POSITIVE_INFINITY;
  let bestCpu = Number.POSITIVE_INFINITY;
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    const cpu0 = process.cpuUsage();
    for (let k = 0; k < callsPerRepeat; k++) f();
    const cpu = process.cpuUsage(cpu0);
    best = Math.min(best, (performance.now() - t0) / callsPerRepeat);
    bestCpu = Math.min(bestCpu, (cpu.user + cpu.system) / 1000 / callsPerRepeat);
  }
  return { ms: best, cpuMs: bestCpu, callsPerRepeat };
}

/**
 * `npm run bench -- forward [--only NAME] [--processes N]`: milliseconds per model-image
 * evaluation (ForwardModel.image at the scenario's true parameters, one thread), best of 25
 * repeats of ~60 ms, one JSON line per scenario with what the adaptive sampling did. With
 * `--processes N` each scenario is timed in N fresh processes one after another and one line
 * gives the spread: every worker of a fit is such a fresh process, and a process whose code V8
 * compiled worse would show here as the maximum above the median.
 */
export async function run(args: string[]): Promise<void> {
  const only = benchOption(args, '--only');
  const scenarios = forwardScenarios().filter((s) => only === undefined || s.name === only);
  if (scenarios.length === 0) throw new Error(`--only: no scenario named ${only} (known: demo, compactSource)`);
  const processes = wholeNumberOption(args, '--processes', 0, 0);
  if (processes > 0) {
    for (const scenario of scenarios) freshProcessSpread(scenario.name, processes);
    return;
  }
  const repeats = 25;
  for (const scenario of scenarios) {
    const simulation = simulateObservation(scenario.config, { seed: 1, noiseless: false });
    const forward = fitForwardModel(simulation);
    const model = simulation.truthVector;
    const out = new Float64Array(forward.pixelCount);
    const { ms, cpuMs, callsPerRepeat } = bestMillisecondsPerCall(() => forward.image(model, simulation.amplitudes, out), repeats);
    console.log(JSON.stringify({
      benchmark: 'forward',
      scenario: scenario.name,
      msPerEvaluation: Number(ms.toFixed(4)),
      cpuMsPerEvaluation: Number(cpuMs.toFixed(4)),
      repeats,
      evaluationsPerRepeat: callsPerRepeat,
      supersampling: forward.supersampling,
      leastRelativeTolerance: Number(Math.min(...forward.relativeTolerance).toPrecision(3)),
      usedPixels: forward.usedPixels.length,
      computedPixels: forward.computedPixels.length,
      raysTraced: forward.varying.raysTraced,
      raysInterpolated: forward.varying.raysInterpolated,
      pixelsByLevel: Array.from(forward.varying.pixelsByLevel),
      subPixelFactors: Array.from(forward.varying.factors),
      psf: `${forward.convolvedPsf.columns}x${forward.convolvedPsf.rows}${forward.separable ? ' separable' : ''}`,
    }));
  }
}

/** Times one scenario in `count` fresh processes and prints the spread of their best times. */
function freshProcessSpread(name: string, count: number): void {
  const benchMain = fileURLToPath(new URL('./main.js', import.meta.url));
  const ms: number[] = [];
  const cpuMs: number[] = [];
  for (let k = 0; k < count; k++) {
    const text = execFileSync(process.execPath, [benchMain, 'forward', '--only', name], { encoding: 'utf8' });
    const line = JSON.parse(text.trim().split('\n').pop()!) as { msPerEvaluation: number; cpuMsPerEvaluation: number };
    ms.push(line.msPerEvaluation);
    cpuMs.push(line.cpuMsPerEvaluation);
  }
  const sorted = [...ms].sort((a, b) => a - b);
  const median = sorted[Math.floor((count - 1) / 2)];
  console.log(JSON.stringify({
    benchmark: 'forward', scenario: name, freshProcesses: count,
    medianMs: median, minMs: sorted[0], maxMs: sorted[count - 1],
    worstOverMedian: Number((sorted[count - 1] / median).toFixed(3)),
    msEach: ms, cpuMsEach: cpuMs,
  }));
}
