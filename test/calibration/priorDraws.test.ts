import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../../src/config/arcsiftConfig.js';
import { SeededStream } from '../../src/numeric/random/seededStream.js';
import { kolmogorovSmirnovPValue, kolmogorovSmirnovUniform } from '../../src/numeric/statistics/kolmogorovSmirnov.js';
import { priorSampler } from '../../src/calibration/calibrationDraws.js';
import { configWithValues } from '../../src/calibration/configWithValues.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';

// The calibration's draws must follow the priors the fit assumes. Each prior's CDF sends its
// draws to U(0, 1) (the probability integral transform), checked by Kolmogorov-Smirnov at
// p > 0.001 on 2000 draws: uniform, log-uniform and periodic priors of the demo config, and its
// perturber's disc prior, uniform in area (r^2 / R^2 uniform, angle uniform).
const demo = loadConfig(fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url)));

function ksP(values: number[]): number {
  return kolmogorovSmirnovPValue(kolmogorovSmirnovUniform(Float64Array.from(values)), values.length);
}

describe('prior draws of a calibration', () => {
  const draw = priorSampler(demo, 1);
  const stream = SeededStream.fromSeed(5);
  const draws = Array.from({ length: 2000 }, () => draw(stream));

  it('follow each parameter\'s prior', () => {
    const checks: [string, (v: number) => number][] = [
      ['lens.mass[0].einsteinRadiusArcsec', (v) => (v - 1.05) / 0.25],
      ['lens.mass[0].positionAngleDeg', (v) => v / 180],
      ['source.light[0].effectiveRadiusArcsec', (v) => Math.log(v / 0.05) / Math.log(0.4 / 0.05)],
      ['perturbers[0].log10MassSolar', (v) => (v - 7) / 4],
    ];
    for (const [name, cdf] of checks) expect(ksP(draws.map((d) => cdf(d[name]))), name).toBeGreaterThan(0.001);
  });

  it('place the perturber uniformly over its disc prior', () => {
    const [cx, cy, radius] = [0.72, 0.92, 0.3];
    const dx = draws.map((d) => d['perturbers[0].centerXArcsec'] - cx);
    const dy = draws.map((d) => d['perturbers[0].centerYArcsec'] - cy);
    expect(Math.max(...dx.map((x, k) => Math.hypot(x, dy[k])))).toBeLessThanOrEqual(radius + 1e-12);
    expect(ksP(dx.map((x, k) => (x * x + dy[k] * dy[k]) / (radius * radius)))).toBeGreaterThan(0.001);
    expect(ksP(dx.map((x, k) => (Math.atan2(dy[k], x) + Math.PI) / (2 * Math.PI)))).toBeGreaterThan(0.001);
  });

  it('draw only the smooth model\'s parameters for a draw without perturbers, and put a draw into the config', () => {
    const smooth = priorSampler(demo, 0)(SeededStream.fromSeed(6));
    expect(Object.keys(smooth).some((name) => name.startsWith('perturbers'))).toBe(false);
    const values = new Map(Object.entries(draws[0]));
    const scenario = configWithValues(demo, values, 1);
    const system = buildLensSystem(scenario);
    const configured = system.configuredValues();
    for (const [name, value] of values) expect(configured[system.parameters.findIndex((p) => p.name === name)], name).toBe(value);
    expect(configWithValues(demo, new Map(Object.entries(smooth)), 0).perturbers).toEqual([]);
  });
});
