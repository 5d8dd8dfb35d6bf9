import { describe, expect, it } from 'vitest';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../../../src/numeric/sparse/symmetricCsr.js';
import { accumulate, denseOf, spdCases, uniformStream } from './sparseTestMatrices.js';

/** The lower triangle of a compressed matrix as a dense row-major n x n array. */
function lowerDense(m: SymmetricCsr): number[][] {
  const a = Array.from({ length: m.size }, () => new Array<number>(m.size).fill(0));
  for (let i = 0; i < m.size; i++) for (let p = m.rowStart[i]; p < m.rowStart[i + 1]; p++) a[i][m.column[p]] = m.value[p];
  return a;
}

describe('SymmetricSparseAccumulator', () => {
  it('sums duplicates, folds (column, row) onto the lower triangle and sorts columns', () => {
    // Hand-built: A = [[1, 2, 0], [2, 0, 5], [0, 5, 3]] from split and mirrored contributions.
    const acc = new SymmetricSparseAccumulator();
    acc.reset(3);
    acc.add(2, 2, 1);
    acc.add(1, 2, 4);
    acc.add(0, 0, 1);
    acc.add(2, 1, 1);
    acc.add(0, 1, 2);
    acc.add(2, 2, 2);
    const m = acc.compress();
    expect(m.size).toBe(3);
    expect(Array.from(m.rowStart.subarray(0, 4))).toEqual([0, 1, 2, 4]);
    expect(Array.from(m.column.subarray(0, 4))).toEqual([0, 0, 1, 2]);
    expect(Array.from(m.value.subarray(0, 4))).toEqual([1, 2, 5, 3]);
    expect(acc.contributions).toBe(6);
  });

  it('reproduces the dense matrix of every test case (strictly increasing columns, all <= row)', () => {
    const u = uniformStream(11);
    const acc = new SymmetricSparseAccumulator();
    for (const c of spdCases()) {
      const m = accumulate(acc, c, u);
      let ordered = true;
      for (let i = 0; i < m.size; i++) {
        for (let p = m.rowStart[i]; p < m.rowStart[i + 1]; p++) {
          if (m.column[p] > i || (p > m.rowStart[i] && m.column[p] <= m.column[p - 1])) ordered = false;
        }
      }
      expect(ordered, c.name).toBe(true);
      const dense = denseOf(c);
      const lower = lowerDense(m);
      // Each value is the sum of two exact halves, so the match is exact.
      const expected = Array.from({ length: c.n }, (_, i) => Array.from({ length: c.n }, (_, j) => (j <= i ? dense.get(i, j) : 0)));
      expect(lower).toEqual(expected);
      expect(m.rowStart[m.size]).toBe(c.rows.length);
    }
  });

  it('gives the same result when reused for smaller and larger matrices, with growing buffers', () => {
    const u = uniformStream(3);
    const reused = new SymmetricSparseAccumulator();
    const cases = spdCases();
    for (const c of [cases[5], cases[1], cases[7], cases[0], cases[3]]) {
      const seed = Math.floor(u() * 1e9);
      const a = accumulate(reused, c, uniformStream(seed));
      const b = accumulate(new SymmetricSparseAccumulator(), c, uniformStream(seed));
      const count = b.rowStart[b.size];
      expect(a.size).toBe(b.size);
      expect(Array.from(a.rowStart.subarray(0, a.size + 1))).toEqual(Array.from(b.rowStart.subarray(0, b.size + 1)));
      expect(Array.from(a.column.subarray(0, count))).toEqual(Array.from(b.column.subarray(0, count)));
      expect(Array.from(a.value.subarray(0, count))).toEqual(Array.from(b.value.subarray(0, count)));
    }
  });

  it('throws RangeError for an index outside the matrix, and accepts an empty matrix', () => {
    const acc = new SymmetricSparseAccumulator();
    acc.reset(3);
    acc.add(3, 0, 1);
    expect(() => acc.compress()).toThrow(RangeError);
    acc.reset(3);
    acc.add(1, -1, 1);
    expect(() => acc.compress()).toThrow(RangeError);
    acc.reset(0);
    expect(acc.compress().rowStart[0]).toBe(0);
    expect(() => acc.reset(-1)).toThrow(RangeError);
  });
});
