import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadConfig, type ArcsiftConfig } from '../../src/config/arcsiftConfig.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { modelParameterSpace } from '../../src/model/modelParameterSpace.js';
import { positionRegionTransform } from '../../src/model/positionRegion.js';
import { sharedInt32Array, sharedUint8Array, type ObservedData } from '../../src/data/index.js';

const configPath = fileURLToPath(new URL('../fixtures/inference/small-lens.yaml', import.meta.url));

function withRegion(region: NonNullable<ArcsiftConfig['perturbers'][number]['positionPrior']>): ArcsiftConfig {
  const config = loadConfig(configPath);
  const p = config.perturbers[0];
  const entries = { ...p.entries };
  for (const name of ['centerXArcsec', 'centerYArcsec'] as const) entries[name] = { ...entries[name], prior: undefined };
  return { ...config, perturbers: [{ ...p, entries, positionPrior: region }] };
}

// Deterministic unit-square points (a 2-D Halton sequence, bases 2 and 3: common practice for
// even coverage), so the checks below are exact statements about the maps, not Monte-Carlo luck.
function halton(index: number, base: number): number {
  let f = 1, r = 0;
  for (let i = index; i > 0; i = Math.floor(i / base)) { f /= base; r += f * (i % base); }
  return r;
}

describe('region priors on a perturber position', () => {
  it('maps the unit square uniformly onto a disc', () => {
    // Reference: for a uniform distribution on a disc of radius R, E[r^2] = R^2 / 2 and the
    // mean position is the centre (common practice).
    const config = withRegion({ region: 'disc', centerXArcsec: 0.4, centerYArcsec: -0.2, radiusArcsec: 0.3 });
    const system = buildLensSystem(config);
    const space = modelParameterSpace(system);
    const map = positionRegionTransform(system, space, {} as ObservedData)!;
    const binding = system.perturbers[0];
    const ux = Array.from(space.freeIndices).indexOf(binding.centerXIndex);
    const uy = Array.from(space.freeIndices).indexOf(binding.centerYIndex);
    const unit = new Float64Array(space.dim).fill(0.5);
    const out = new Float64Array(space.physicalDim);
    let r2 = 0, mx = 0, my = 0;
    const n = 20000;
    for (let k = 1; k <= n; k++) {
      unit[ux] = halton(k, 2); unit[uy] = halton(k, 3);
      map(unit, out);
      const dx = out[binding.centerXIndex] - 0.4, dy = out[binding.centerYIndex] + 0.2;
      expect(dx * dx + dy * dy).toBeLessThanOrEqual(0.09 + 1e-12);
      r2 += dx * dx + dy * dy; mx += dx; my += dy;
    }
    expect(r2 / n).toBeCloseTo(0.045, 3);
    expect(Math.abs(mx / n)).toBeLessThan(1e-3);
    expect(Math.abs(my / n)).toBeLessThan(1e-3);
  });

  it('maps the unit square onto the used pixels of the mask, each equally often', () => {
    const config = withRegion({ region: 'mask' });
    const system = buildLensSystem(config);
    const space = modelParameterSpace(system);
    const columns = 48, rows = 48, scale = 0.08;
    const mask = sharedUint8Array(columns * rows);
    const usedList = [5 * columns + 7, 20 * columns + 30, 40 * columns + 2];
    for (const p of usedList) mask[p] = 1;
    const usedPixels = sharedInt32Array(usedList.length);
    usedPixels.set(usedList);
    const data = { columns, rows, pixelScaleArcsec: scale, mask, usedPixels } as unknown as ObservedData;
    const map = positionRegionTransform(system, space, data)!;
    const binding = system.perturbers[0];
    const ux = Array.from(space.freeIndices).indexOf(binding.centerXIndex);
    const uy = Array.from(space.freeIndices).indexOf(binding.centerYIndex);
    const unit = new Float64Array(space.dim).fill(0.5);
    const out = new Float64Array(space.physicalDim);
    const hits = new Map<number, number>();
    for (let k = 1; k <= 3000; k++) {
      unit[ux] = halton(k, 2); unit[uy] = halton(k, 3);
      map(unit, out);
      const i = Math.round(out[binding.centerXIndex] / scale + (columns - 1) / 2);
      const j = Math.round(out[binding.centerYIndex] / scale + (rows - 1) / 2);
      const pixel = j * columns + i;
      expect(mask[pixel], `point fell in unused pixel (${i}, ${j})`).toBe(1);
      hits.set(pixel, (hits.get(pixel) ?? 0) + 1);
    }
    for (const p of usedList) expect(Math.abs((hits.get(p) ?? 0) - 1000)).toBeLessThanOrEqual(2);
  });

  it('refuses a prior of its own on a centre that has a region prior', () => {
    const config = loadConfig(configPath);
    const p = config.perturbers[0];
    expect(() => buildLensSystem({ ...config, perturbers: [{ ...p, positionPrior: { region: 'mask' } }] }))
      .toThrow(/perturbers\[0\]\.centerXArcsec: with positionPrior the centre takes only a value/);
  });
});
