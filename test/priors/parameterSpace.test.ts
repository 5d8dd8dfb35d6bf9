import normalLogPdf from '@stdlib/stats/base/dists/normal/logpdf';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { ParameterSpace } from '../../src/priors/parameterSpace.js';

// Reference log densities: @stdlib/stats normal logpdf and the closed-form uniform and
// log-uniform densities 1 / width and 1 / (x ln(upper / lower)).
const entries = [
  { name: 'thetaEArcsec', prior: { kind: 'uniform', lower: 0.5, upper: 2 } },
  { name: 'redshiftLens', prior: { kind: 'fixed', value: 0.5 } },
  { name: 'massSolar', prior: { kind: 'logUniform', lower: 1e6, upper: 1e11 } },
  { name: 'positionAngleDeg', prior: { kind: 'periodic', lower: 0, upper: 180 } },
  { name: 'shear', prior: { kind: 'normal', mean: 0, sigma: 0.05 } },
] as const;

describe('ParameterSpace', () => {
  const space = new ParameterSpace(entries);

  it('lists free and fixed parameters in order', () => {
    expect(space.names).toEqual(['thetaEArcsec', 'redshiftLens', 'massSolar', 'positionAngleDeg', 'shear']);
    expect(space.freeNames).toEqual(['thetaEArcsec', 'massSolar', 'positionAngleDeg', 'shear']);
    expect(Array.from(space.freeIndices)).toEqual([0, 2, 3, 4]);
    expect(space.dim).toBe(4);
    expect(space.physicalDim).toBe(5);
    expect(space.periodic).toEqual([false, false, true, false]);
  });

  it('maps the unit cube to physical vectors with fixed values filled in', () => {
    const out = new Float64Array(7).fill(Number.NaN);
    space.fromUnitCube(Float64Array.of(9, 0.5, 0.5, 0.25, 0.5), out, 1, 2);
    expect(out[2]).toBeCloseTo(1.25, 14); // 0.5 + 0.5 * 1.5
    expect(out[3]).toBe(0.5);
    expect(out[4]).toBeCloseTo(Math.sqrt(1e6 * 1e11), 3); // geometric midpoint
    expect(out[5]).toBeCloseTo(45, 12);
    expect(out[6]).toBeCloseTo(0, 14); // normal median
    expect(Number.isNaN(out[0]) && Number.isNaN(out[1])).toBe(true);
  });

  it('sums the free log priors', () => {
    const physical = Float64Array.of(1.2, 0.5, 1e8, 30, 0.02);
    const expected = -Math.log(1.5) - Math.log(1e8 * Math.log(1e5)) - Math.log(180) + normalLogPdf(0.02, 0, 0.05);
    expect(space.logPrior(physical)).toBeCloseTo(expected, 12);
    physical[0] = 3;
    expect(space.logPrior(physical)).toBe(-Infinity);
  });

  it('converts between free and physical vectors', () => {
    const free = Float64Array.of(1.1, 2e7, 10, -0.01);
    const physical = new Float64Array(5);
    space.toPhysical(free, physical);
    expect(Array.from(physical)).toEqual([1.1, 0.5, 2e7, 10, -0.01]);
    const back = new Float64Array(4);
    space.toFree(physical, back);
    expect(Array.from(back)).toEqual(Array.from(free));
  });

  it('wraps periodic parameters by whole periods', () => {
    const physical = Float64Array.of(1, 0.5, 1e7, -30, 0);
    space.wrapPeriodic(physical);
    expect(physical[3]).toBeCloseTo(150, 12);
    physical[3] = 400;
    space.wrapPeriodic(physical);
    expect(physical[3]).toBeCloseTo(40, 12);
    expect(physical[0]).toBe(1);
  });

  it('describes every prior as plain JSON', () => {
    const description = space.describe();
    expect(JSON.parse(JSON.stringify(description))).toEqual(description);
    expect(description[1]).toEqual({
      name: 'redshiftLens', kind: 'fixed', fixed: true, periodic: false, lower: 0.5, upper: 0.5, value: 0.5,
    });
    expect(description[4]).toEqual({
      name: 'shear', kind: 'normal', fixed: false, periodic: false, lower: null, upper: null, mean: 0, sigma: 0.05,
    });
  });

  it('rejects repeated names and bad priors with the config key', () => {
    const repeated = [entries[0], { name: 'thetaEArcsec', prior: { kind: 'fixed', value: 1 } }] as const;
    expect(() => new ParameterSpace(repeated, 'lens')).toThrow(InputError);
    expect(() => new ParameterSpace(repeated, 'lens')).toThrow(/key lens\[1\].*unique.*"thetaEArcsec"/);
    const bad = [{ name: 'q', prior: { kind: 'uniform', lower: 1, upper: 0 } }] as const;
    expect(() => new ParameterSpace(bad, 'lens')).toThrow(/key lens\[0\]\.prior: prior of parameter "q"/);
  });
});
