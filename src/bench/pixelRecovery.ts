import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseConfig, type ArcsiftConfig } from '../config/arcsiftConfig.js';
import { readConfigFile } from '../config/readConfigFile.js';
import { loadObservedData } from '../data/loadObservedData.js';
import { compareModels } from '../inference/compareModels.js';
import { defaultThreadCount } from '../parallel/workerPool.js';
import { runDefaults } from '../settings/runDefaults.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';

// The mocks of test/inference/pixelatedRecovery.test.ts (an invented lens with a clumpy source),
// compared in full by nested sampling: the test's reduced version holds the source's nuisance
// parameters at their best fit and integrates the perturber's prior on a grid.
const fixture = fileURLToPath(new URL('../../test/fixtures/inference/clumpy-lens.yaml', import.meta.url));

interface EditableConfig { source: { light: Record<string, unknown>[] } }

function sourceVariant(kind: 'pixelated' | 'sersic'): ArcsiftConfig {
  const data = readConfigFile(fixture) as EditableConfig;
  if (kind === 'sersic') {
    data.source.light = [...data.source.light.filter((c) => c.kind !== 'pixelated'), {
      kind: 'sersic', amplitude: 10,
      effectiveRadiusArcsec: { value: 0.2, prior: { logUniform: [0.05, 0.8] } },
      sersicIndex: { value: 1, prior: { uniform: [0.5, 4] } },
      axisRatio: { value: 0.8, prior: { uniform: [0.4, 1] } },
      positionAngleDeg: { value: 60, prior: { periodic: [0, 180] } },
      centerXArcsec: { value: 0.12, prior: { uniform: [-0.3, 0.3] } },
      centerYArcsec: { value: 0.08, prior: { uniform: [-0.3, 0.3] } },
    }];
  }
  return parseConfig(data, fixture);
}

/**
 * `npm run bench -- pixelRecovery [--only absent|planted] [--live-points N]`: `compare` of the
 * smooth and perturbed models with a Sersic and with a pixelated source on two mocks of the
 * clumpy test lens: no subhalo (seed 12) and a truncated NFW of M200 = 1e10 on the arc (seed
 * 11). One JSON line per mock and source: ln B with its error, the evaluations and seconds, and
 * the perturber's log10 M200 median and 95% interval. Takes tens of minutes on 2 cores.
 */
export async function run(args: string[]): Promise<void> {
  const only = benchOption(args, '--only');
  const livePoints = wholeNumberOption(args, '--live-points', 50);
  const settings = { ...runDefaults.nested, livePoints, threads: defaultThreadCount() };
  for (const mock of ['absent', 'planted'].filter((m) => only === undefined || m === only)) {
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-bench-'));
    try {
      const truth = sourceVariant('pixelated');
      simulateToFolder(mock === 'absent' ? { ...truth, perturbers: [] } : truth, folder, { seed: mock === 'absent' ? 12 : 11, noiseless: false });
      const data = loadObservedData({ folder }, {});
      for (const source of ['sersic', 'pixelated'] as const) {
        const started = performance.now();
        const c = await compareModels(sourceVariant(source), data, { smooth: settings, perturbed: settings });
        const p = c.perturbers[0];
        console.log(JSON.stringify({
          benchmark: 'pixelRecovery', mock, source, livePoints,
          lnBayesFactor: Number(c.lnBayesFactor.toFixed(2)), lnBayesFactorError: Number(c.lnBayesFactorError.toFixed(2)),
          evaluations: { smooth: c.smooth.result.evaluations, perturbed: c.perturbed.result.evaluations },
          seconds: Number(((performance.now() - started) / 1000).toFixed(1)),
          log10M200: p.log10M200 === null ? null : { median: Number(p.log10M200.median.toFixed(2)), interval95: [Number(p.log10M200.interval95.lower.toFixed(2)), Number(p.log10M200.interval95.upper.toFixed(2))] },
          truthLog10M200: mock === 'planted' ? 10 : null,
        }));
      }
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  }
}
