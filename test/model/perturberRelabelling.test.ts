import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { modelParameterSpace } from '../../src/model/modelParameterSpace.js';
import { perturberRelabelling } from '../../src/model/perturberRelabelling.js';
import { withPerturberCount } from '../../src/inference/comparePerturberCounts.js';
import { runNested } from '../../src/sampling/nested/index.js';

const configPath = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

describe('relabelling identical perturbers', () => {
  it('orders three identical perturbers by x and keeps each block together', () => {
    const config = withPerturberCount(loadConfig(configPath), 3);
    const system = buildLensSystem(config);
    const space = modelParameterSpace(system);
    const relabel = perturberRelabelling(system, space)!;
    expect(relabel).toBeDefined();
    const physical = new Float64Array(space.physicalDim);
    const unit = new Float64Array(space.dim);
    for (let trial = 0; trial < 50; trial++) {
      for (let k = 0; k < unit.length; k++) unit[k] = ((trial * 7919 + k * 104729) % 1000) / 1000;
      space.fromUnitCube(unit, physical);
      const before = system.perturbers.map((p) => [physical[p.centerXIndex], physical[p.centerYIndex], physical[p.massIndex]].join());
      relabel(physical);
      const xs = system.perturbers.map((p) => physical[p.centerXIndex]);
      expect([...xs].sort((a, b) => a - b)).toEqual(xs);
      const after = system.perturbers.map((p) => [physical[p.centerXIndex], physical[p.centerYIndex], physical[p.massIndex]].join());
      expect([...after].sort()).toEqual([...before].sort());
    }
  });

  it('leaves perturbers with different priors alone', () => {
    const base = withPerturberCount(loadConfig(configPath), 2);
    const second = base.perturbers[1];
    const changed = { ...base, perturbers: [base.perturbers[0], { ...second, entries: { ...second.entries, truncationRatio: { key: 'perturbers[1].truncationRatio', value: 4, prior: undefined } } }] };
    const system = buildLensSystem(changed);
    expect(perturberRelabelling(system, modelParameterSpace(system))).toBeUndefined();
  });

  it('does not change the evidence of a likelihood symmetric under relabelling', async () => {
    // Reference: Z = integral of L over the unit square with L(x1, x2) = N(x1; 0.3, 0.05) N(x2; 0.7, 0.05)
    // + N(x1; 0.7, 0.05) N(x2; 0.3, 0.05), which is 2 (to 1e-12: the Gaussians lie well inside
    // the square); sorting the pair inside the transform must give the same ln Z = ln 2.
    const gauss = (x: number, m: number): number => Math.exp(-0.5 * ((x - m) / 0.05) ** 2) / (0.05 * Math.sqrt(2 * Math.PI));
    const problem = (sorted: boolean) => ({
      dim: 2, physicalDim: 2,
      transform: (u: Float64Array, out: Float64Array) => {
        out[0] = u[0]; out[1] = u[1];
        if (sorted && out[0] > out[1]) { const t = out[0]; out[0] = out[1]; out[1] = t; }
      },
      logLikelihood: (points: Float64Array, count: number) => Float64Array.from({ length: count }, (_, r) => {
        const a = points[2 * r]; const b = points[2 * r + 1];
        return Math.log(gauss(a, 0.3) * gauss(b, 0.7) + gauss(a, 0.7) * gauss(b, 0.3));
      }),
    });
    for (const sorted of [false, true]) {
      const result = await runNested(problem(sorted), { livePoints: 300, seed: 5, method: 'ellipsoids' });
      expect(Math.abs(result.lnZ - Math.log(2))).toBeLessThan(3 * result.lnZError);
    }
  });
});
