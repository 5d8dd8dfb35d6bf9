import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { gaussianShellsLnEvidence, gaussianShellsProblem } from '../../../src/sampling/nested/problems/gaussianShells.js';
import { runNested } from '../../../src/sampling/nested/runNested.js';

const fixture = JSON.parse(readFileSync(new URL('./fixtures/shell_evidence.json', import.meta.url), 'utf8')) as {
  rows: Array<{ dim: number; lnZ: number }>;
};

describe('Gaussian shells reference evidence', () => {
  it('radial Gauss-Legendre quadrature matches SciPy adaptive quadrature (fixtures/make_shell_evidence.py)', () => {
    // Two independent quadratures of the same radial integral: agreement to 1e-9 in ln Z.
    for (const row of fixture.rows) expect(Math.abs(gaussianShellsLnEvidence(row.dim) - row.lnZ)).toBeLessThan(1e-9);
  });

  it('matches the values tabulated by Feroz & Hobson 2008, Table 1 (from memory, quoted to 0.01)', () => {
    const tabulated: Array<[number, number]> = [
      [2, -1.75],
      [5, -5.67],
      [10, -14.59],
      [20, -36.09],
    ];
    for (const [dim, lnZ] of tabulated) expect(Math.abs(gaussianShellsLnEvidence(dim) - lnZ)).toBeLessThan(0.006);
  });
});

describe('nested sampling of the Gaussian shells (Feroz & Hobson 2008, Section 6.2)', () => {
  // Truth from the radial quadrature above. The estimate must lie within 3 reported errors
  // (Skilling's sqrt(H/N), a 1-sigma error: a 0.3% chance of a false failure for a correct sampler)
  // and the error itself below 0.2 (our accuracy target); 400 live points give ~0.08 (2-D)
  // and ~0.13 (5-D).
  for (const dim of [2, 5]) {
    it(`ln Z within 3 reported errors in ${dim} dimensions`, async () => {
      const truth = gaussianShellsLnEvidence(dim);
      const result = await runNested(gaussianShellsProblem(dim), { livePoints: 400, seed: 11, method: 'ellipsoids', evidence: 'nested' });
      expect(result.stopReason).toBe('converged');
      expect(result.lnZError).toBeLessThan(0.2);
      expect(Math.abs(result.lnZ - truth)).toBeLessThan(3 * result.lnZError);
      // The simulated-shrinkage error estimates the same spread (Higson et al. 2018): within 30%.
      expect(Math.abs(result.lnZErrorSimulated / result.lnZError - 1)).toBeLessThan(0.3);
      // Normalised posterior weights.
      let total = 0;
      for (let i = 0; i < result.count; i++) total += Math.exp(result.lnWeight[i]);
      expect(Math.abs(total - 1)).toBeLessThan(1e-12);
    });
  }
});
