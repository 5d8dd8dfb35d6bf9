import normalCdf from '@stdlib/stats/base/dists/normal/cdf';
import normalLogCdf from '@stdlib/stats/base/dists/normal/logcdf';
import truncatedNormalPdf from '@stdlib/stats/base/dists/truncated-normal/pdf';
import uniformCdf from '@stdlib/stats/base/dists/uniform/cdf';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { makePrior, type PriorSpec } from '../../src/priors/index.js';

// Reference CDFs come from @stdlib/stats (npm registry), a general-purpose library independent
// of the erfcinv/erfcx code the priors use. Where stdlib has no distribution of that kind the
// reference is a closed form written out beside it.

const UNIT_GRID = [1e-12, 1e-6, 0.001, 0.02, 0.1, 0.25, 0.5, 0.75, 0.9, 0.98, 0.999, 1 - 1e-6, 1 - 1e-12];

// Composite Simpson rule over [a, b] with n (even) intervals.
function simpson(f: (x: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let sum = f(a) + f(b);
  for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}

/** A reference CDF giving both F(x) and 1 - F(x), each computed without cancellation. */
type ReferenceCdf = (x: number) => { below: number; above: number };

function simple(cdf: (x: number) => number): ReferenceCdf {
  return (x) => ({ below: cdf(x), above: 1 - cdf(x) });
}

function expectInverseOf(spec: PriorSpec, cdf: ReferenceCdf, tolerance: number): void {
  const prior = makePrior('p', spec);
  for (const u of UNIT_GRID) {
    const x = prior.fromUnit(u);
    expect(x).toBeGreaterThanOrEqual(prior.lower);
    expect(x).toBeLessThanOrEqual(prior.upper);
    // Relative tolerance on u (on 1 - u in the upper half), since the check is made where the
    // probability itself is tiny, plus the CDF change caused by rounding x itself to a double,
    // density * 4 eps |x|: no inverse CDF can do better than that resolution. In the upper half
    // u itself is only known to eps / 2 (the spacing of doubles below 1), so eps is added there.
    const { below, above } = cdf(x);
    const resolution = Math.exp(prior.logDensity(x)) * 4 * Number.EPSILON * Math.abs(x);
    if (u < 0.5) expect(Math.abs(below - u)).toBeLessThanOrEqual(tolerance * u + resolution);
    else expect(Math.abs(above - (1 - u))).toBeLessThanOrEqual(tolerance * (1 - u) + resolution + Number.EPSILON);
  }
}

describe('fromUnit is the inverse of an independent CDF', () => {
  it('uniform (stdlib uniform cdf)', () => {
    expectInverseOf({ kind: 'uniform', lower: -2, upper: 5 }, simple((x) => uniformCdf(x, -2, 5)), 1e-9);
  });

  it('periodic (stdlib uniform cdf on one period)', () => {
    expectInverseOf({ kind: 'periodic', lower: 0, upper: 360 }, simple((x) => uniformCdf(x, 0, 360)), 1e-9);
  });

  it('log-uniform (stdlib uniform cdf of ln x on [ln lower, ln upper])', () => {
    const lower = 1e6;
    const upper = 1e11;
    expectInverseOf(
      { kind: 'logUniform', lower, upper },
      simple((x) => uniformCdf(Math.log(x), Math.log(lower), Math.log(upper))),
      1e-9,
    );
  });

  it('normal (stdlib normal cdf), including 1e-12 tails', () => {
    // 1e-9 relative: erfcinv and stdlib's cdf are both good to ~1e-15 relative; the slack covers
    // the condition number |x phi(x) / Phi(x)| ~ 50 at u = 1e-12.
    // Upper half by symmetry, 1 - Phi(x) = Phi(2 mean - x), to avoid cancellation.
    expectInverseOf(
      { kind: 'normal', mean: 1.5, sigma: 0.3 },
      (x) => ({ below: normalCdf(x, 1.5, 0.3), above: normalCdf(3 - x, 1.5, 0.3) }),
      1e-9,
    );
  });

  it('truncated normal straddling the mean (stdlib normal cdf on the window)', () => {
    const [mean, sigma, a, b] = [0.2, 1.3, -1, 3];
    const fa = normalCdf(a, mean, sigma);
    const fb = normalCdf(b, mean, sigma);
    expectInverseOf(
      { kind: 'truncatedNormal', mean, sigma, lower: a, upper: b },
      (x) => ({
        below: (normalCdf(x, mean, sigma) - fa) / (fb - fa),
        above: (fb - normalCdf(x, mean, sigma)) / (fb - fa),
      }),
      1e-8,
    );
  });

  it('truncated normal wholly in the far upper and lower tails (stdlib normal logcdf)', () => {
    // Windows 40 to 41 sigma from the mean: Q(40) ~ 1e-350 underflows a double, so the reference
    // CDF is built from stdlib's log CDF, ratios formed with expm1 so neither side cancels.
    const [mean, sigma] = [3, 2];
    const ratio = (logNumerator: number, logDenominator: number): number =>
      -Math.expm1(logNumerator - logDenominator);
    {
      // Upper tail: log Q(x) = log Phi(2 mean - x); F = (Q(a) - Q(x)) / (Q(a) - Q(b)).
      const [a, b] = [mean + 40 * sigma, mean + 41 * sigma];
      const logQ = (x: number): number => normalLogCdf(2 * mean - x, mean, sigma);
      expectInverseOf({ kind: 'truncatedNormal', mean, sigma, lower: a, upper: b }, (x) => ({
        below: ratio(logQ(x), logQ(a)) / ratio(logQ(b), logQ(a)),
        above: (Math.exp(logQ(x) - logQ(a)) * ratio(logQ(b), logQ(x))) / ratio(logQ(b), logQ(a)),
      }), 1e-8);
    }
    {
      // Lower tail: F = (Phi(x) - Phi(a)) / (Phi(b) - Phi(a)).
      const [a, b] = [mean - 41 * sigma, mean - 40 * sigma];
      const logPhi = (x: number): number => normalLogCdf(x, mean, sigma);
      expectInverseOf({ kind: 'truncatedNormal', mean, sigma, lower: a, upper: b }, (x) => ({
        below: (Math.exp(logPhi(x) - logPhi(b)) * ratio(logPhi(a), logPhi(x))) / ratio(logPhi(a), logPhi(b)),
        above: ratio(logPhi(x), logPhi(b)) / ratio(logPhi(a), logPhi(b)),
      }), 1e-8);
    }
  });

  it('one-sided truncation far out approaches the exponential tail: median a + ln2 / a', () => {
    // Mills-ratio asymptotics (common practice): N(0,1) restricted to [a, inf) is a + Exp(a) to
    // first order in 1/a^2, so its median is a + ln 2 / a (1 + O(1/a^2)); at a = 60, 1/a^2 ~ 3e-4.
    const a = 60;
    const prior = makePrior('p', { kind: 'truncatedNormal', mean: 0, sigma: 1, lower: a, upper: a + 5 });
    const excess = prior.fromUnit(0.5) - a;
    expect(Math.abs(excess / (Math.LN2 / a) - 1)).toBeLessThan(2e-3);
  });
});

describe('logDensity is normalised', () => {
  // Simpson with 20000 intervals: error ~ h^4 f'''' is below 1e-10 for these smooth densities,
  // so 1e-7 is a loose but meaningful bound (a wrong normaliser is off by far more).
  const cases: Array<[string, PriorSpec, number, number]> = [
    ['uniform', { kind: 'uniform', lower: -2, upper: 5 }, -2, 5],
    ['periodic', { kind: 'periodic', lower: -Math.PI, upper: Math.PI }, -Math.PI, Math.PI],
    ['normal', { kind: 'normal', mean: 4, sigma: 0.5 }, 4 - 20 * 0.5, 4 + 20 * 0.5],
    ['truncatedNormal', { kind: 'truncatedNormal', mean: 0, sigma: 2, lower: -1, upper: 6 }, -1, 6],
    ['truncatedNormal far tail', { kind: 'truncatedNormal', mean: 0, sigma: 1, lower: 30, upper: 31 }, 30, 31],
  ];
  for (const [label, spec, a, b] of cases) {
    it(label, () => {
      const prior = makePrior('p', spec);
      expect(Math.abs(simpson((x) => Math.exp(prior.logDensity(x)), a, b, 20000) - 1)).toBeLessThan(1e-7);
    });
  }

  it('logUniform (integrated in t = ln x, dx = e^t dt)', () => {
    const [lower, upper] = [1e-3, 1e4];
    const prior = makePrior('p', { kind: 'logUniform', lower, upper });
    // exp(ln lower) may round just outside the support, so x is clamped onto it.
    const xOf = (t: number): number => Math.min(upper, Math.max(lower, Math.exp(t)));
    const integral = simpson(
      (t) => Math.exp(prior.logDensity(xOf(t))) * xOf(t), Math.log(lower), Math.log(upper), 20000,
    );
    expect(Math.abs(integral - 1)).toBeLessThan(1e-7);
  });

  it('truncated normal density matches stdlib truncated-normal pdf', () => {
    const prior = makePrior('p', { kind: 'truncatedNormal', mean: 0.5, sigma: 1.2, lower: -0.3, upper: 2 });
    for (const x of [-0.3, 0, 0.7, 1.9]) {
      expect(prior.logDensity(x)).toBeCloseTo(Math.log(truncatedNormalPdf(x, -0.3, 2, 0.5, 1.2)), 12);
    }
  });

  it('is -Infinity outside the support', () => {
    expect(makePrior('p', { kind: 'uniform', lower: 0, upper: 1 }).logDensity(1.5)).toBe(-Infinity);
    expect(makePrior('p', { kind: 'logUniform', lower: 1, upper: 2 }).logDensity(0.5)).toBe(-Infinity);
    expect(makePrior('p', { kind: 'truncatedNormal', mean: 0, sigma: 1, lower: 0, upper: 1 }).logDensity(-0.1))
      .toBe(-Infinity);
    const fixed = makePrior('p', { kind: 'fixed', value: 2 });
    expect(fixed.logDensity(2)).toBe(0);
    expect(fixed.logDensity(2.1)).toBe(-Infinity);
    expect(fixed.fromUnit(0.3)).toBe(2);
    expect(fixed.isFixed).toBe(true);
  });
});

describe('bad priors are rejected with the parameter name', () => {
  const bad: Array<[string, unknown, RegExp]> = [
    ['inverted bounds', { kind: 'uniform', lower: 2, upper: 1 }, /lower < upper.*lower = 2, upper = 1/],
    ['equal bounds', { kind: 'periodic', lower: 1, upper: 1 }, /lower < upper/],
    ['non-positive log-uniform', { kind: 'logUniform', lower: 0, upper: 1 }, /0 < lower.*found lower = 0/],
    ['zero sigma', { kind: 'normal', mean: 0, sigma: 0 }, /sigma: expected a number > 0, found 0/],
    ['negative sigma', { kind: 'truncatedNormal', mean: 0, sigma: -1, lower: 0, upper: 1 }, /sigma/],
    ['NaN', { kind: 'normal', mean: Number.NaN, sigma: 1 }, /mean: expected a finite number, found NaN/],
    ['infinite bound', { kind: 'uniform', lower: 0, upper: Infinity }, /upper: expected a finite number/],
    ['string number', { kind: 'fixed', value: '3' }, /value: expected a finite number, found "3"/],
    ['no mass', { kind: 'truncatedNormal', mean: 0, sigma: 1, lower: 1e200, upper: 2e200 }, /holding some probability/],
    ['unknown kind', { kind: 'gaussian', mean: 0, sigma: 1 }, /kind: expected one of uniform.*found "gaussian"/],
  ];
  for (const [label, spec, message] of bad) {
    it(label, () => {
      let caught: unknown;
      try {
        makePrior('einsteinRadiusArcsec', spec as PriorSpec, { key: 'lens.priors.einsteinRadiusArcsec' });
      } catch (error) {
        caught = error;
      }
      expect(caught).toBeInstanceOf(InputError);
      const text = (caught as Error).message;
      expect(text).toContain('"einsteinRadiusArcsec"');
      expect(text).toContain('key lens.priors.einsteinRadiusArcsec');
      expect(text).toMatch(message);
    });
  }
});
