import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { accumulateGramBand, bandOffset, rowSpan, WeightedGramBand, type SortedSparseRows } from '../../../src/numeric/sparse/weightedGramBand.js';
import { UNIT_ROUNDOFF } from './denseFronts.js';
import { uniformStream } from './sparseTestMatrices.js';

/** Rows of `cells` columns, each a sorted run of random entries inside a window of `width` columns. */
function randomRows(rows: number, cells: number, width: number, u: () => number): SortedSparseRows {
  const rowStart = [0];
  const column: number[] = [];
  const value: number[] = [];
  for (let r = 0; r < rows; r++) {
    const first = Math.floor(u() * (cells - width + 1));
    for (let c = first; c < first + width; c++) {
      if (u() < 0.6) {
        column.push(c);
        value.push(u() - 0.3);
      }
    }
    rowStart.push(column.length);
  }
  return { rowCount: rows, rowStart: Int32Array.from(rowStart), column: Int32Array.from(column), value: Float64Array.from(value) };
}

function denseOf(b: SortedSparseRows, cells: number): Matrix {
  const m = Matrix.zeros(b.rowCount, cells);
  for (let r = 0; r < b.rowCount; r++) for (let k = b.rowStart[r]; k < b.rowStart[r + 1]; k++) m.set(r, b.column[k], b.value[k]);
  return m;
}

// Reference: B^T W B by ml-matrix's mmul. Each entry is a sum of at most `rows` products, so it
// lies within gamma_rows (|B|^T W |B|)_ab of the exact value (Higham 2002, "Accuracy and Stability
// of Numerical Algorithms", eq. 3.5, from memory); ours and the reference each.
describe('WeightedGramBand', () => {
  it('accumulates the lower triangle of B^T W B into the band, as ml-matrix computes it', () => {
    const u = uniformStream(51);
    for (const [rows, cells, width] of [[1, 1, 1], [5, 7, 3], [40, 30, 8], [300, 120, 25]]) {
      const b = randomRows(rows, cells, width, u);
      const w = Float64Array.from({ length: rows }, () => 0.5 + u());
      const band = rowSpan(b);
      expect(band).toBeLessThanOrEqual(width);
      const result = new WeightedGramBand().accumulate(b, w, cells, band);
      const dense = denseOf(b, cells);
      const weighted = Matrix.diag(Array.from(w));
      const expected = dense.transpose().mmul(weighted).mmul(dense);
      const magnitude = Matrix.abs(dense).transpose().mmul(weighted).mmul(Matrix.abs(dense));
      const gamma = (rows * UNIT_ROUNDOFF) / (1 - rows * UNIT_ROUNDOFF);
      for (let a = 0; a < cells; a++) {
        for (let c = Math.max(0, a - band + 1); c <= a; c++) {
          expect(Math.abs(result[bandOffset(a, c, band)] - expected.get(a, c)), `${rows} rows at (${a}, ${c})`).toBeLessThanOrEqual(2 * gamma * magnitude.get(a, c));
        }
        for (let c = 0; c <= a - band; c++) expect(expected.get(a, c), 'outside the band').toBe(0);
      }
    }
  });

  it('gives the plain loop\'s bits, and a cleared band is reused without a trace of the last call', () => {
    const u = uniformStream(52);
    const gram = new WeightedGramBand();
    for (const [rows, cells, width] of [[200, 100, 20], [50, 100, 9], [400, 100, 30]]) {
      const b = randomRows(rows, cells, width, u);
      const w = Float64Array.from({ length: rows }, () => 0.5 + u());
      const band = rowSpan(b);
      const plain = new Float64Array(cells * band);
      accumulateGramBand(b, w, band, plain);
      const result = gram.accumulate(b, w, cells, band);
      expect(Array.from(result.subarray(0, cells * band))).toEqual(Array.from(plain));
      result.fill(0);
    }
  });
});
