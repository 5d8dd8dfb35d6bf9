// The ordering fixtures, and measures of an ordering: profile and bandwidth of a permuted pattern.
import { readFileSync } from 'node:fs';
import type { SymmetricCsr } from '../../../src/numeric/sparse/symmetricCsr.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';

/** Whether order[0 .. n - 1] holds each of 0 .. n - 1 once. */
export function isPermutation(order: ArrayLike<number>, n: number): boolean {
  const seen = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    const v = order[k];
    if (!(Number.isInteger(v) && v >= 0 && v < n) || seen[v] === 1) return false;
    seen[v] = 1;
  }
  return true;
}

/**
 * Profile (sum over rows of the distance from the leftmost nonzero to the diagonal, George &
 * Liu 1981, chapter 4) and bandwidth (largest such distance) of `matrix` permuted by `order`.
 */
export function profileAndBandwidth(matrix: SymmetricCsr, order: ArrayLike<number>): { profile: number; bandwidth: number } {
  const n = matrix.size;
  const position = new Int32Array(n);
  for (let k = 0; k < n; k++) position[order[k]] = k;
  const first = Int32Array.from({ length: n }, (_, i) => i);
  let bandwidth = 0;
  for (let r = 0; r < n; r++) {
    for (let p = matrix.rowStart[r]; p < matrix.rowStart[r + 1]; p++) {
      const a = position[r];
      const b = position[matrix.column[p]];
      const hi = Math.max(a, b);
      const lo = Math.min(a, b);
      first[hi] = Math.min(first[hi], lo);
      bandwidth = Math.max(bandwidth, hi - lo);
    }
  }
  let profile = 0;
  for (let i = 0; i < n; i++) profile += i - first[i];
  return { profile, bandwidth };
}

export interface ScipyCase {
  name: string;
  n: number;
  rows: number[];
  columns: number[];
  scipyOrder: number[];
  scipyProfile: number;
  scipyBandwidth: number;
  shuffledProfile: number;
  shuffledBandwidth: number;
}

// Patterns and scipy.sparse.csgraph.reverse_cuthill_mckee orderings from fixtures/make_rcm_fixtures.py.
export const scipyCases = (JSON.parse(readFileSync(new URL('./fixtures/rcm.json', import.meta.url), 'utf8')) as { cases: ScipyCase[] }).cases;

/** The fixture's pattern with ones as values. */
export function patternOf(c: ScipyCase): SymmetricCsr {
  const acc = new SymmetricSparseAccumulator();
  acc.reset(c.n);
  for (let t = 0; t < c.rows.length; t++) acc.add(c.rows[t], c.columns[t], 1);
  for (let i = 0; i < c.n; i++) acc.add(i, i, 1);
  return acc.compress();
}
