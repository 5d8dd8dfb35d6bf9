// SeparableBlur's WebAssembly path (M transposed, the two passes, B^T transposed, all in the
// kernel's memory) against its JavaScript twin: SparseRows.transposeOf, fillTransposeRows,
// transposeOf (the reference: the loop is itself checked against the direct convolution in
// blurredMapping.test.ts). Same operations in the same order, so B^T and B must agree to the bit.
import { describe, expect, it } from 'vitest';
import { SeparableBlur } from '../../src/inversion/separableBlur.js';
import { separableBlurModule } from '../../src/inversion/separableBlurKernel.js';
import { SparseRows } from '../../src/inversion/sparseRows.js';
import { uniformSequence } from '../support/uniformSequence.js';

const columns = 30, rows = 24;
const all = Int32Array.from({ length: columns * rows }, (_, p) => p);

/** M^T of `cells` cells: each cell a few random pixels with random values. */
function randomTranspose(cells: number, perCell: number, seed: number): SparseRows {
  const random = uniformSequence(seed);
  const mt = new SparseRows();
  mt.reset(cells, cells * perCell);
  let end = 0;
  for (let c = 0; c < cells; c++) {
    const count = 1 + Math.floor(random() * perCell);
    const picked = new Set<number>();
    while (picked.size < count) picked.add(Math.floor(random() * all.length));
    for (const p of picked) {
      mt.column[end] = p;
      mt.value[end++] = random() - 0.2;
    }
    mt.rowStart[c + 1] = end;
  }
  mt.rowCount = cells;
  return mt;
}

type Rows = { start: number[]; column: number[]; value: number[] };

function rowsOf(m: SparseRows): Rows {
  const end = m.rowStart[m.rowCount];
  return { start: Array.from(m.rowStart.subarray(0, m.rowCount + 1)), column: Array.from(m.column.subarray(0, end)), value: Array.from(m.value.subarray(0, end)) };
}

/** B^T and B by the JavaScript twin, for the mapping M of `cells` cells. */
function plainRows(blur: SeparableBlur, m: SparseRows, cells: number, usedCount: number): [Rows, Rows] {
  const mt = new SparseRows();
  mt.transposeOf(m, cells);
  const bt = new SparseRows();
  bt.reset(cells, 16);
  blur.fillTransposeRows(mt, bt, cells);
  const b = new SparseRows();
  b.transposeOf(bt, usedCount);
  return [rowsOf(bt), rowsOf(b)];
}

function wasmRows(blur: SeparableBlur, m: SparseRows, cells: number): [Rows, Rows] {
  const bt = new SparseRows(), b = new SparseRows();
  blur.fillFromMapping(m, cells, bt, b);
  return [rowsOf(bt), rowsOf(b)];
}

describe('SeparableBlur in WebAssembly', () => {
  it('is available on this engine (else every test below would compare the loop with itself)', () => {
    expect(separableBlurModule).not.toBeNull();
    expect(new SeparableBlur(columns, rows, Float64Array.of(1), Float64Array.of(1), all, all, all.length).runsInWasm).toBe(true);
  });

  it.each([
    ['a 7 x 7 kernel, used pixels in a frame', 7, 7, all.filter((p) => p % columns > 3 && p % columns < 26 && Math.floor(p / columns) > 2)],
    ['a 9 x 5 kernel, every pixel used (more output than the first memory holds)', 9, 5, all],
  ])('gives the JavaScript B^T and B to the bit: %s, over calls that grow and shrink', (_, kx, ky, used) => {
    const random = uniformSequence(kx * 10 + ky);
    const alongX = Float64Array.from({ length: kx }, () => 0.1 + random());
    const alongY = Float64Array.from({ length: ky }, () => 0.1 + random());
    const wasm = new SeparableBlur(columns, rows, alongX, alongY, used, all, all.length);
    const plain = new SeparableBlur(columns, rows, alongX, alongY, used, all, all.length);
    // A small call first (a small memory), then larger ones that outgrow it, then a small one.
    for (const [cells, perCell, seed] of [[1, 1, 1], [40, 3, 2], [300, 12, 3], [5, 2, 4]] as const) {
      const m = new SparseRows();
      m.transposeOf(randomTranspose(cells, perCell, seed), all.length);
      const [bt, b] = wasmRows(wasm, m, cells);
      const [expectedBt, expectedB] = plainRows(plain, m, cells, used.length);
      expect(bt, `${cells} cells: B^T`).toEqual(expectedBt);
      expect(b, `${cells} cells: B`).toEqual(expectedB);
    }
  });
});
