import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { erf } from '../../src/numeric/special/stdlibSpecial.js';
import { pixelIntegratedPsf } from '../../src/imaging/pixelIntegratedPsf.js';
import { readFitsImage } from '../../src/fits/index.js';

/** A circular Gaussian of `sigma` (in cells) integrated over each cell of an odd n x n grid centred on its middle cell (erf, closed form). */
function cellIntegratedGaussian(n: number, sigma: number, cellWidth: number): Float64Array {
  const half = (n - 1) / 2;
  const one = Float64Array.from({ length: n }, (_, k) => {
    const lower = (k - half - 0.5) * cellWidth;
    return (erf((lower + cellWidth) / (sigma * Math.SQRT2)) - erf(lower / (sigma * Math.SQRT2))) / 2;
  });
  const values = new Float64Array(n * n);
  for (let b = 0; b < n; b++) for (let a = 0; a < n; a++) values[b * n + a] = one[a] * one[b];
  return values;
}

describe('pixel-integrated PSF from an oversampled one', () => {
  it('with an odd factor, sums cells into exactly the Gaussian integrated over image pixels', () => {
    // Cells 1/3 pixel wide tile each pixel, so the pixel integral is the sum of its cells'
    // integrals (erf differences telescope): only rounding separates the two, 1e-15 per value.
    const factor = 3;
    const sigmaPixels = 0.9;
    const kernel = pixelIntegratedPsf({ columns: 27, rows: 27, values: cellIntegratedGaussian(27, sigmaPixels, 1 / factor) }, factor);
    expect([kernel.columns, kernel.rows]).toEqual([9, 9]);
    const direct = cellIntegratedGaussian(9, sigmaPixels, 1);
    for (let k = 0; k < direct.length; k++) expect(Math.abs(kernel.values[k] - direct[k])).toBeLessThan(1e-15);
  });

  it('matches the independent downsampling of make_pipeline.py (cells split in halves) for factors 3 and 4', () => {
    // The same float32 cells summed in another order and grouping: 1e-12 allows the rounding of
    // sums of a thousand values; a misplaced half-weight or an off-by-one centre would err by 1e-3.
    const folder = new URL('../fixtures/pipeline/', import.meta.url);
    const expected = JSON.parse(readFileSync(new URL('expected.json', folder), 'utf8')).detectorPsf;
    for (const factor of [3, 4]) {
      const image = readFitsImage(fileURLToPath(new URL(`psf-oversampled${factor}.fits`, folder)));
      const kernel = pixelIntegratedPsf({ columns: image.nx, rows: image.ny, values: image.data }, factor);
      expect(kernel.columns).toBe(expected[factor].size);
      expected[factor].values.forEach((v: number, k: number) => expect(Math.abs(kernel.values[k] - v)).toBeLessThan(1e-12));
      const inputSum = image.data.reduce((s, v) => s + v, 0);
      expect(Math.abs(kernel.values.reduce((s, v) => s + v, 0) - inputSum)).toBeLessThan(1e-12);
    }
  });

  it('keeps a non-square kernel centred and every cell (flux kept)', () => {
    const values = new Float64Array(5 * 9).map((_, k) => 1 + (k % 7));
    const kernel = pixelIntegratedPsf({ columns: 5, rows: 9, values }, 2);
    // Columns: 2 cells either side of the centre need one pixel each way; rows: 4 cells need 2.
    expect([kernel.columns, kernel.rows]).toEqual([3, 5]);
    expect(kernel.values.reduce((s, v) => s + v, 0)).toBeCloseTo(values.reduce((s, v) => s + v, 0), 12);
  });
});
