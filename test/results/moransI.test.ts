import { describe, expect, it } from 'vitest';
import { gridNeighbours } from '../../src/results/gridNeighbours.js';
import { moransI } from '../../src/results/moransI.js';
import { moransIPermutationTest } from '../../src/results/moransIPermutationTest.js';
import { readResultsFixture } from './fixtureFile.js';

interface Case {
  name: string; columns: number; rows: number; image: number[]; used: number[]; scheme: 'rook' | 'queen';
  statistic: number; expectation: number; varianceNormality: number; varianceRandomisation: number;
}
const fixture = readResultsFixture<{ cases: Case[] }>('morans_i.json');
const usedValues = (c: Case): number[] => c.image.filter((_, g) => c.used[g] === 1);

describe("Moran's I and its moments", () => {
  it('match numpy with dense weights and the general formulas (fixtures/make_morans_i.py)', () => {
    // The fixture computes S1, S2 from the weight matrix; arcsift uses S1 = 2 S0, S2 = 4 sum d^2.
    // Both are exact up to rounding: 1e-12 relative (absolute for I near zero).
    for (const c of fixture.cases) {
      const result = moransI(usedValues(c), gridNeighbours(c.columns, c.rows, c.used, c.scheme));
      expect(Math.abs(result.statistic - c.statistic)).toBeLessThan(1e-12);
      expect(result.expectation).toBeCloseTo(c.expectation, 14);
      expect(Math.abs(result.varianceNormality / c.varianceNormality - 1)).toBeLessThan(1e-12);
      expect(Math.abs(result.varianceRandomisation / c.varianceRandomisation - 1)).toBeLessThan(1e-12);
    }
  });

  it('is -1 on a checkerboard with rook neighbours', () => {
    // Every rook pair has opposite signs and the mean is zero on an even grid (Cliff & Ord 1981,
    // the extreme of negative autocorrelation): I = (n / S0)(-S0) / n = -1.
    const columns = 10, rows = 8, image = Array.from({ length: 80 }, (_, g) => (g % columns + Math.floor(g / columns)) % 2);
    expect(moransI(image, gridNeighbours(columns, rows, new Array(80).fill(1), 'rook')).statistic).toBeCloseTo(-1, 14);
  });

  it('is near +1 on a smooth gradient: the hand-derived value on a 40 x 40 ramp', () => {
    // Values = column c, z_c = c - 19.5. Rook pairs: vertical ones give z_c^2, 2 (N - 1) per column;
    // horizontal ones z_c z_(c+1), 2N per pair of columns; S0 = 4N(N - 1); sum z^2 = N sum_c z_c^2.
    // With sum_c z_c^2 = N (N^2 - 1)/12 = 5330 and sum_c z_c z_(c+1) = 5330 - 39/2 - 19.5^2 = 4930.25,
    // I = [2(N - 1) + 2N (4930.25 / 5330)] / (4 (N - 1)) = 0.97437...
    const n = 40, image = Array.from({ length: n * n }, (_, g) => g % n);
    const expected = (2 * (n - 1) + 2 * n * (4930.25 / 5330)) / (4 * (n - 1));
    expect(moransI(image, gridNeighbours(n, n, new Array(n * n).fill(1), 'rook')).statistic).toBeCloseTo(expected, 12);
    expect(expected).toBeGreaterThan(0.97);
  });
});

describe("Moran's I permutation test", () => {
  it('its permutation distribution has the randomisation mean and variance', () => {
    // Under randomisation Cliff & Ord's moments are the exact moments over all permutations. With
    // 20,000 shuffles the mean's standard error is sqrt(Var / 20000) (< 1.1e-3 here) and the
    // variance's relative one sqrt((kurtosis - 1) / 20000), below 2% for a kurtosis under 9:
    // bounds 5e-3 and 6%, three standard errors and more, on the skewed (exponential) annulus case.
    for (const c of fixture.cases.filter((k) => k.name.startsWith('exponential'))) {
      const neighbours = gridNeighbours(c.columns, c.rows, c.used, c.scheme);
      const test = moransIPermutationTest(usedValues(c), neighbours, 20000, 7);
      expect(Math.abs(test.permutationMean - c.expectation)).toBeLessThan(5e-3);
      expect(Math.abs(test.permutationVariance / c.varianceRandomisation - 1)).toBeLessThan(0.06);
    }
  });

  it('gives the same p-value for the same seed, and p = 1/(N + 1) for a ramp no shuffle reaches', () => {
    const c = fixture.cases.find((k) => k.name.startsWith('normal') && k.scheme === 'rook')!;
    const neighbours = gridNeighbours(c.columns, c.rows, c.used, c.scheme);
    expect(moransIPermutationTest(usedValues(c), neighbours, 199, 3)).toEqual(moransIPermutationTest(usedValues(c), neighbours, 199, 3));
    const ramp = Array.from({ length: 400 }, (_, g) => g % 20 + Math.floor(g / 20));
    const rampNeighbours = gridNeighbours(20, 20, new Array(400).fill(1), 'rook');
    expect(moransIPermutationTest(ramp, rampNeighbours, 99, 5).pValue).toBe(0.01);
  });
});
