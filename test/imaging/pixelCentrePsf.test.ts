import { describe, expect, it } from 'vitest';
import { pixelCentrePsf } from '../../src/imaging/pixelCentrePsf.js';

/** A circular Gaussian of `sigma` pixels sampled at the centres of an odd n x n grid of cells `cell` pixels wide (closed form, common practice). */
function sampledGaussian(n: number, sigma: number, cell: number): Float64Array {
  const half = (n - 1) / 2;
  const values = new Float64Array(n * n);
  for (let b = 0; b < n; b++) {
    for (let a = 0; a < n; a++) values[b * n + a] = Math.exp(-(((a - half) * cell) ** 2 + ((b - half) * cell) ** 2) / (2 * sigma * sigma));
  }
  return values;
}

describe('a finely sampled PSF reduced to the image pixels', () => {
  for (const factor of [3, 4]) {
    it(`keeps the cells at pixel centres (factor ${factor}): the Gaussian sampled at pixel centres, normalised, to 1e-15`, () => {
      // 8 factor + 1 cells: the centre cell and 4 pixels either side.
      const n = 8 * factor + 1;
      const fine = sampledGaussian(n, 0.9, 1 / factor);
      const kernel = pixelCentrePsf({ columns: n, rows: n, values: fine }, factor);
      const direct = sampledGaussian(kernel.columns, 0.9, 1);
      const total = direct.reduce((s, v) => s + v, 0);
      expect([kernel.columns, kernel.rows]).toEqual([9, 9]);
      for (let k = 0; k < direct.length; k++) expect(Math.abs(kernel.values[k] - direct[k] / total)).toBeLessThan(1e-15);
    });
  }
});
