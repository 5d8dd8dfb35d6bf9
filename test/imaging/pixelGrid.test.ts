import { describe, expect, it } from 'vitest';
import {
  binSupersampled, fillPixelCentres, fillSubsetCentres, fillSupersampledCentres, pixelGrid,
} from '../../src/imaging/pixelGrid.js';
import { InputError } from '../../src/errors.js';

describe('pixel grid', () => {
  it('puts pixel (i, j) at ((i - (nx-1)/2) s, (j - (ny-1)/2) s), row-major (DEVELOPERS.md)', () => {
    const grid = pixelGrid(3, 2, 0.1);
    const x = new Float64Array(6);
    const y = new Float64Array(6);
    fillPixelCentres(grid, x, y);
    // Hand-computed: columns at -0.1, 0, 0.1; rows at -0.05, 0.05; index j * 3 + i.
    expect(Array.from(x)).toEqual([-0.1, 0, 0.1, -0.1, 0, 0.1]);
    expect(Array.from(y)).toEqual([-0.05, -0.05, -0.05, 0.05, 0.05, 0.05]);
  });

  it('supersamples a 2 x 2 grid by 2 and bins back (hand-computed)', () => {
    // s = 1: pixel centres at +-0.5; sub-pixel centres at pixel centre +- 0.25. Pixel p's four
    // sub-pixels are [4p, 4p + 4), sub-pixel (a, b) at 4p + 2b + a.
    const grid = pixelGrid(2, 2, 1);
    const x = new Float64Array(16);
    const y = new Float64Array(16);
    fillSupersampledCentres(grid, 2, x, y);
    expect(Array.from(x)).toEqual([
      -0.75, -0.25, -0.75, -0.25, 0.25, 0.75, 0.25, 0.75,
      -0.75, -0.25, -0.75, -0.25, 0.25, 0.75, 0.25, 0.75,
    ]);
    expect(Array.from(y)).toEqual([
      -0.75, -0.75, -0.25, -0.25, -0.75, -0.75, -0.25, -0.25,
      0.25, 0.25, 0.75, 0.75, 0.25, 0.25, 0.75, 0.75,
    ]);
    const fine = Float64Array.from({ length: 16 }, (_, k) => k + 1);
    const binned = new Float64Array(4);
    binSupersampled(fine, 2, 4, binned);
    expect(Array.from(binned)).toEqual([2.5, 6.5, 10.5, 14.5]);
  });

  it('binning a linear brightness gives its value at the pixel centre (midpoint rule is exact)', () => {
    const grid = pixelGrid(5, 4, 0.05);
    const factor = 3;
    const x = new Float64Array(20 * 9);
    const y = new Float64Array(20 * 9);
    fillSupersampledCentres(grid, factor, x, y);
    const fine = x.map((xv, k) => 2 + 3 * xv - 7 * y[k]);
    const binned = new Float64Array(20);
    binSupersampled(fine, factor, 20, binned);
    const cx = new Float64Array(20);
    const cy = new Float64Array(20);
    fillPixelCentres(grid, cx, cy);
    for (let p = 0; p < 20; p++) expect(binned[p]).toBeCloseTo(2 + 3 * cx[p] - 7 * cy[p], 13);
  });

  it('gives the sub-pixels of a subset of pixels in the order listed', () => {
    const grid = pixelGrid(2, 2, 1);
    const all = { x: new Float64Array(16), y: new Float64Array(16) };
    fillSupersampledCentres(grid, 2, all.x, all.y);
    const subset = { x: new Float64Array(8), y: new Float64Array(8) };
    fillSubsetCentres(grid, 2, [3, 1], subset.x, subset.y);
    expect(Array.from(subset.x)).toEqual([...all.x.slice(12, 16), ...all.x.slice(4, 8)]);
    expect(Array.from(subset.y)).toEqual([...all.y.slice(12, 16), ...all.y.slice(4, 8)]);
  });

  it('refuses impossible grids with InputError naming the key', () => {
    expect(() => pixelGrid(0, 3, 0.1)).toThrow(InputError);
    expect(() => pixelGrid(3, 2.5, 0.1)).toThrow(/grid\.rows/);
    expect(() => pixelGrid(3, 3, -1, 'data')).toThrow(/data\.pixelScaleArcsec/);
  });
});
