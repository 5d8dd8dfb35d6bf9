// The lattice's scatter of one basis onto its padded plane, and the brightest listed pixel it
// finds on the way (src/forward/pixelLattice.ts), against a direct scan of the listed pixels in
// raster order (the definition: the listed pixel of largest |value|, the first of equals).
import { describe, expect, it } from 'vitest';
import { pixelGrid } from '../../src/imaging/pixelGrid.js';
import { PixelLattice } from '../../src/forward/pixelLattice.js';

function brightestByScan(lattice: PixelLattice, base: number): number {
  let brightest = -1, peak = -1;
  for (const q of Int32Array.from(lattice.pixelsPadded).sort()) {
    const value = Math.abs(lattice.values[base + q]);
    if (value > peak) {
      peak = value;
      brightest = q;
    }
  }
  return brightest;
}

describe('the pixel lattice', () => {
  const grid = pixelGrid(9, 7, 0.1);
  const pixels = Int32Array.of(10, 11, 12, 20, 29, 30, 31, 40);

  it('scatters each basis onto its plane and finds the brightest listed pixel, the first of equals', () => {
    const lattice = new PixelLattice(grid, pixels, 2, true);
    const n = lattice.count;
    // Basis 0: a tie between two listed pixels (the first in raster order wins) and a larger value
    // on a ring ray (not listed, so not the brightest). Basis 1: a negative value is the largest.
    const rayOf = (q: number): number => lattice.padded.indexOf(q);
    lattice.out.fill(0.5);
    lattice.out[rayOf(lattice.pixelsPadded[2])] = -3;
    lattice.out[rayOf(lattice.pixelsPadded[5])] = 3;
    lattice.out[lattice.padded.findIndex((q) => !lattice.pixelsPadded.includes(q))] = 9;
    for (let e = 0; e < n; e++) lattice.out[n + e] = Math.sin(e);
    lattice.out[n + rayOf(lattice.pixelsPadded[6])] = -2;
    for (const k of [0, 1]) {
      const base = k * lattice.planeSize;
      lattice.scatterValues(k, base);
      for (let e = 0; e < n; e++) expect(lattice.values[base + lattice.padded[e]]).toBe(lattice.out[k * n + e]);
      expect(lattice.brightest).toBe(brightestByScan(lattice, base));
    }
    lattice.scatterValues(0, 0);
    expect(lattice.brightest).toBe(lattice.pixelsPadded[2]);
  });

  it('finds the same pixel, the first of equals in raster order, whatever the order of the list', () => {
    const lattice = new PixelLattice(grid, Int32Array.from(pixels).reverse(), 1, true);
    const rayOf = (q: number): number => lattice.padded.indexOf(q);
    lattice.out.fill(0.25);
    lattice.out[rayOf(lattice.pixelsPadded[1])] = 2;
    lattice.out[rayOf(lattice.pixelsPadded[4])] = -2;
    lattice.scatterValues(0, 0);
    expect(lattice.brightest).toBe(brightestByScan(lattice, 0));
    expect(lattice.brightest).toBe(Math.min(lattice.pixelsPadded[1], lattice.pixelsPadded[4]));
  });
});
