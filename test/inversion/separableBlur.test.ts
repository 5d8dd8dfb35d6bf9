// SeparableBlur's WebAssembly passes against its JavaScript loop (the reference: the loop is
// itself checked against the direct convolution in blurredMapping.test.ts). Same operations in
// the same order, so the rows of B^T must agree to the bit.
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

function rowsOf(blur: SeparableBlur, mt: SparseRows, cells: number): { start: number[]; column: number[]; value: number[] } {
  const out = new SparseRows();
  out.reset(cells, 16);
  blur.fillTransposeRows(mt, out, cells);
  const end = out.rowStart[cells];
  return { start: Array.from(out.rowStart.subarray(0, cells + 1)), column: Array.from(out.column.subarray(0, end)), value: Array.from(out.value.subarray(0, end)) };
}

describe('SeparableBlur in WebAssembly', () => {
  it('is available on this engine (else every test below would compare the loop with itself)', () => {
    expect(separableBlurModule).not.toBeNull();
  });

  it.each([
    ['a 7 x 7 kernel, used pixels in a frame', 7, 7, all.filter((p) => p % columns > 3 && p % columns < 26 && Math.floor(p / columns) > 2)],
    ['a 9 x 5 kernel, every pixel used (more output than the first memory holds)', 9, 5, all],
  ])('gives the JavaScript rows of B^T to the bit: %s, over calls that grow and shrink', (_, kx, ky, used) => {
    const random = uniformSequence(kx * 10 + ky);
    const alongX = Float64Array.from({ length: kx }, () => 0.1 + random());
    const alongY = Float64Array.from({ length: ky }, () => 0.1 + random());
    const wasm = new SeparableBlur(columns, rows, alongX, alongY, used, all, all.length);
    const plain = new SeparableBlur(columns, rows, alongX, alongY, used, all, all.length, true);
    // A small call first (a small memory), then larger ones that outgrow it, then a small one.
    for (const [cells, perCell, seed] of [[1, 1, 1], [40, 3, 2], [300, 12, 3], [5, 2, 4]] as const) {
      const mt = randomTranspose(cells, perCell, seed);
      expect(rowsOf(wasm, mt, cells), `${cells} cells`).toEqual(rowsOf(plain, mt, cells));
    }
  });
});
