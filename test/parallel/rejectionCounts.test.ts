import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { loadObservedData } from '../../src/data/index.js';
import { RejectionTallies } from '../../src/inference/rejectionTallies.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { LikelihoodPool } from '../../src/parallel/likelihoodPool.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';

// A pixelated source answers minus infinity when its mesh cannot be built, and the run must say
// how often and why, whichever thread evaluated the point. A lens vector with a non-finite
// Einstein radius traces every vertex to NaN, which no triangulation accepts: each such point is
// one rejection for the mesh (common practice: a non-finite vertex has no triangle). Scenario:
// the invented clumpy test lens of test/fixtures/inference (an adaptive mesh of 200 cells).
const configPath = fileURLToPath(new URL('../fixtures/inference/clumpy-lens.yaml', import.meta.url));

describe('pixelated-source rejections through the likelihood pool', () => {
  const config = loadConfig(configPath);
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-rejections-'));
  simulateToFolder(config, folder, { seed: 3, noiseless: false });
  const data = loadObservedData({ folder }, {});
  const truth = buildLensSystem(config, { perturberCount: 0 }).configuredValues();
  const width = truth.length;
  /** `count` points, those at the listed rows with a NaN Einstein radius (parameter 0). */
  const batch = (count: number, broken: number[]): Float64Array => {
    const points = new Float64Array(count * width);
    for (let r = 0; r < count; r++) {
      points.set(truth, r * width);
      if (broken.includes(r)) points[r * width] = Number.NaN;
    }
    return points;
  };

  for (const threads of [1, 2]) {
    it(`adds up the rejections by reason on ${threads} thread(s), and a run's tallies continue from a checkpoint's`, async () => {
      const pool = await LikelihoodPool.start({ config, data, perturberCount: 0 }, threads);
      try {
        const values = await pool.evaluate(batch(6, [1, 4, 5]), 6);
        expect(Array.from(values, (v) => v === Number.NEGATIVE_INFINITY)).toEqual([false, true, false, false, true, true]);
        expect(pool.rejections).toEqual({ mesh: 3, notPositiveDefinite: 0, regularisation: 0, triangleFallbacks: 0 });
        // A run started now counts from here, plus what its checkpoint held.
        const tallies = new RejectionTallies(pool.model(0));
        tallies.restore({ mesh: 10, notPositiveDefinite: 2, triangleFallbacks: 7 });
        await Promise.all([pool.evaluate(batch(3, [0]), 3), pool.evaluate(batch(4, [2, 3]), 4)]);
        expect(pool.model(0).rejections).toEqual({ mesh: 6, notPositiveDefinite: 0, regularisation: 0, triangleFallbacks: 0 });
        expect(tallies.counts).toEqual({ mesh: 13, notPositiveDefinite: 2, regularisation: 0, triangleFallbacks: 7 });
        expect(tallies.read()).toEqual({ mesh: 13, notPositiveDefinite: 2, regularisation: 0, triangleFallbacks: 7 });
        expect(() => tallies.restore({ mesh: -1 })).toThrow(/whole count/);
      } finally {
        await pool.close();
      }
    });
  }
});
