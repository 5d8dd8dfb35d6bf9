import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import type { SymmetricCsr } from '../../../src/numeric/sparse/symmetricCsr.js';
import { accumulateGramBand, bandOffset, rowSpan, WeightedGramBand, type GrowableLowerRows, type SortedSparseRows } from '../../../src/numeric/sparse/weightedGramBand.js';
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

describe('WeightedGramBand.compactRows', () => {
  /** Compressed rows with room that grows as compactRows asks. */
  function rowsOf(cells: number, room: number): GrowableLowerRows & { rowStart: Int32Array; column: Int32Array; value: Float64Array } {
    return {
      rowStart: new Int32Array(cells + 1), column: new Int32Array(room), value: new Float64Array(room),
      grow(entries: number) {
        const column = new Int32Array(entries), value = new Float64Array(entries);
        column.set(this.column);
        value.set(this.value);
        this.column = column;
        this.value = value;
      },
    };
  }

  /** A lower triangle of a few entries per row within `reach` of the diagonal, diagonal included. */
  function lowerOf(cells: number, reach: number, u: () => number): SymmetricCsr {
    const rowStart = [0], column: number[] = [], value: number[] = [];
    for (let j = 0; j < cells; j++) {
      for (let c = Math.max(0, j - reach); c < j; c++) if (u() < 0.3) { column.push(c); value.push(u() - 0.5); }
      column.push(j);
      value.push(1 + u());
      rowStart.push(column.length);
    }
    return { size: cells, rowStart: Int32Array.from(rowStart), column: Int32Array.from(column), value: Float64Array.from(value) };
  }

  it('reads out B^T W B + s H as ml-matrix computes it, and the kernel gives its JavaScript twin\'s bits', () => {
    // Reference: ml-matrix's B^T W B plus s H, within the bound of the accumulation test above.
    const u = uniformStream(53);
    const kernel = new WeightedGramBand();
    const twin = new WeightedGramBand('javaScript');
    for (const [rows, cells, width, reach] of [[1, 1, 1, 0], [30, 40, 6, 2], [300, 120, 25, 9], [200, 60, 10, 20], [500, 400, 40, 3]]) {
      const b = randomRows(rows, cells, width, u);
      const w = Float64Array.from({ length: rows }, () => 0.5 + u());
      const h = lowerOf(cells, reach, u);
      const scale = 0.1 + u();
      const band = Math.max(rowSpan(b), reach + 1);
      const results = [kernel, twin].map((gram) => {
        const out = rowsOf(cells, 3);
        gram.accumulate(b, w, cells, band, h.rowStart[cells]);
        const entries = gram.compactRows(h, scale, cells, band, out);
        expect(out.rowStart[cells], `${rows} rows, ${gram.engine}`).toBe(entries);
        return out;
      });
      const [fromKernel, fromTwin] = results;
      const entries = fromTwin.rowStart[cells];
      expect(Array.from(fromKernel.rowStart)).toEqual(Array.from(fromTwin.rowStart));
      expect(Array.from(fromKernel.column.subarray(0, entries))).toEqual(Array.from(fromTwin.column.subarray(0, entries)));
      expect(Array.from(fromKernel.value.subarray(0, entries))).toEqual(Array.from(fromTwin.value.subarray(0, entries)));
      const dense = denseOf(b, cells);
      const weighted = Matrix.diag(Array.from(w));
      const expected = dense.transpose().mmul(weighted).mmul(dense);
      const magnitude = Matrix.abs(dense).transpose().mmul(weighted).mmul(Matrix.abs(dense));
      for (let j = 0; j < cells; j++) for (let k = h.rowStart[j]; k < h.rowStart[j + 1]; k++) expected.set(j, h.column[k], expected.get(j, h.column[k]) + scale * h.value[k]);
      const gamma = ((rows + 1) * UNIT_ROUNDOFF) / (1 - (rows + 1) * UNIT_ROUNDOFF);
      const found = Matrix.zeros(cells, cells);
      for (let j = 0; j < cells; j++) {
        for (let t = fromTwin.rowStart[j]; t < fromTwin.rowStart[j + 1]; t++) {
          expect(fromTwin.column[t], 'columns increase along a row').toBeGreaterThan(t > fromTwin.rowStart[j] ? fromTwin.column[t - 1] : -1);
          expect(fromTwin.value[t], 'only nonzeros').not.toBe(0);
          found.set(j, fromTwin.column[t], fromTwin.value[t]);
        }
        for (let c = 0; c <= j; c++) {
          const bound = 2 * gamma * (magnitude.get(j, c) + Math.abs(expected.get(j, c)));
          expect(Math.abs(found.get(j, c) - expected.get(j, c)), `${rows} rows at (${j}, ${c})`).toBeLessThanOrEqual(bound);
        }
      }
    }
  });

  it('writes its rows in chunks and leaves the band all zero for the next call', () => {
    // 800 cells in a band of 800, nearly full: about 320,000 entries, more than the 262,144 of
    // one chunk. A second, different call on the same instances must not see the first.
    const u = uniformStream(54);
    const kernel = new WeightedGramBand();
    const twin = new WeightedGramBand('javaScript');
    for (const [rows, width] of [[1500, 800], [400, 30]]) {
      const cells = 800;
      const b = randomRows(rows, cells, width, u);
      const w = Float64Array.from({ length: rows }, () => 0.5 + u());
      const h = lowerOf(cells, 1, u);
      const band = rowSpan(b);
      const [fromKernel, fromTwin] = [kernel, twin].map((gram) => {
        const out = rowsOf(cells, 10);
        gram.accumulate(b, w, cells, band, h.rowStart[cells]);
        gram.compactRows(h, 2, cells, band, out);
        return out;
      });
      const entries = fromTwin.rowStart[cells];
      if (width === 800) expect(entries).toBeGreaterThan(1 << 18);
      expect(Array.from(fromKernel.rowStart)).toEqual(Array.from(fromTwin.rowStart));
      expect(Array.from(fromKernel.value.subarray(0, entries))).toEqual(Array.from(fromTwin.value.subarray(0, entries)));
      expect(Array.from(fromKernel.column.subarray(0, entries))).toEqual(Array.from(fromTwin.column.subarray(0, entries)));
    }
  });
});

describe('WeightedGramBand.project', () => {
  it('gives B^T W v as ml-matrix computes it, the kernel its twin\'s bits, for one to three vectors', () => {
    // Reference: ml-matrix's B^T times each weighted vector; each entry a sum of at most `rows`
    // products, so within gamma_rows (|B|^T |W v|)_k (Higham 2002, eq. 3.5, from memory).
    const u = uniformStream(55);
    const kernel = new WeightedGramBand();
    const twin = new WeightedGramBand('javaScript');
    for (const [rows, cells, width, count] of [[1, 1, 1, 1], [40, 30, 8, 2], [300, 120, 25, 3], [50, 200, 9, 1]]) {
      const b = randomRows(rows, cells, width, u);
      const w = Float64Array.from({ length: rows }, () => 0.5 + u());
      const weighted = Float64Array.from({ length: count * rows }, () => u() - 0.4);
      const band = rowSpan(b);
      const [fromKernel, fromTwin] = [kernel, twin].map((gram) => {
        gram.accumulate(b, w, cells, band, 0, count);
        return gram.project(weighted, count, cells).slice(0, count * cells);
      });
      expect(Array.from(fromKernel), `${rows} rows, ${count} vectors`).toEqual(Array.from(fromTwin));
      const dense = denseOf(b, cells);
      const gamma = (rows * UNIT_ROUNDOFF) / (1 - rows * UNIT_ROUNDOFF);
      for (let a = 0; a < count; a++) {
        const v = Matrix.columnVector(Array.from(weighted.subarray(a * rows, (a + 1) * rows)));
        const expected = dense.transpose().mmul(v);
        const magnitude = Matrix.abs(dense).transpose().mmul(Matrix.abs(v));
        for (let k = 0; k < cells; k++) {
          expect(Math.abs(fromTwin[a * cells + k] - expected.get(k, 0)), `${rows} rows, vector ${a}, cell ${k}`).toBeLessThanOrEqual(2 * gamma * magnitude.get(k, 0));
        }
      }
    }
  });
});
