import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadObservedData } from '../data/loadObservedData.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { simulateToFolder } from '../model/simulateToFolder.js';
import { bestMillisecondsPerCall, forwardScenarios } from './forward.js';

/**
 * `npm run bench -- likelihood`: milliseconds per PixelLikelihood.logLikelihood (the model with
 * the config's perturbers, at the true parameters) on one thread, for the scenarios of the
 * forward benchmark (supersampling 8), each simulated to a temporary folder and read back as a
 * fit reads its data. "allThreads" is left null for the worker-pool figure.
 */
export async function run(_args: string[]): Promise<void> {
  for (const scenario of forwardScenarios()) {
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-'));
    try {
      simulateToFolder(scenario.config, folder, { seed: 1, noiseless: false });
      const { observation } = scenario.config;
      const data = loadObservedData({ folder }, {
        columns: observation.columns, rows: observation.rows, pixelScaleArcsec: observation.pixelScaleArcsec,
      });
      const likelihood = new PixelLikelihood(scenario.config, data, scenario.config.perturbers.length);
      const model = likelihood.system.configuredValues();
      const { ms, cpuMs, callsPerRepeat } = bestMillisecondsPerCall(() => likelihood.logLikelihood(model));
      console.log(JSON.stringify({
        benchmark: 'likelihood',
        scenario: scenario.name,
        msPerCall: Number(ms.toFixed(4)),
        cpuMsPerCall: Number(cpuMs.toFixed(4)),
        oneThread: true,
        repeats: 25,
        callsPerRepeat,
        supersampling: observation.supersampling,
        usedPixels: data.usedPixels.length,
        computedPixels: likelihood.forward.computedPixels.length,
        allThreads: null,
      }));
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  }
}
