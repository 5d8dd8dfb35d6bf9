import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeFits } from '../../src/fits/index.js';
import { InputError } from '../../src/errors.js';
import { readFlags } from '../../src/vet/readFlags.js';
import { npyBytes } from '../io/npyBytes.js';

// Synthetic probability maps on a 40 x 30 grid of 0.1" pixels (pixel (i, j) at
// x = (i - 19.5) * 0.1, y = (j - 14.5) * 0.1, README convention), every pixel in the mask.
const columns = 40;
const rows = 30;
const scale = 0.1;
const data = { columns, rows, pixelScaleArcsec: scale, mask: new Uint8Array(columns * rows).fill(1) };
const folder = mkdtempSync(join(tmpdir(), 'arcsift-maps-'));

/** Sum of circular Gaussian blobs exp(-r^2 / 2 sigma^2) * peak at the given centres (arcsec). */
function blobs(centres: readonly (readonly [number, number, number])[], sigmaArcsec: number): Float64Array {
  const map = new Float64Array(columns * rows);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const x = (i - (columns - 1) / 2) * scale;
      const y = (j - (rows - 1) / 2) * scale;
      let v = 0;
      for (const [cx, cy, peak] of centres) v += peak * Math.exp(-((x - cx) ** 2 + (y - cy) ** 2) / (2 * sigmaArcsec ** 2));
      map[i + columns * j] = Math.min(1, v);
    }
  }
  return map;
}

function writeMapFits(name: string, values: Float64Array, nx = columns, ny = rows): string {
  const path = join(folder, name);
  writeFits(path, { primary: { data: values, nx, ny } });
  return path;
}

function writeMapNpy(name: string, values: Float64Array, nx = columns, ny = rows): string {
  // numpy's C order of an array of shape (rows, columns) is arcsift's row-major order.
  const path = join(folder, name);
  writeFileSync(path, npyBytes({ descr: '<f8', fortran: false, shape: [ny, nx], values: Array.from(values) }));
  return path;
}

describe('candidates from a probability map', () => {
  // Two blobs, centred off the pixel grid, with peak probability 0.9 and 0.7.
  const centres = [[0.62, -0.33, 0.9], [-1.04, 0.71, 0.7]] as const;
  const map = blobs(centres, 0.12);

  for (const [format, write] of [['FITS', writeMapFits], ['NPY', writeMapNpy]] as const) {
    it(`finds the two blobs of a ${format} map at their centres, highest first`, () => {
      const flags = readFlags(write(`two-blobs.${format === 'FITS' ? 'fits' : 'npy'}`, map), data);
      expect(flags.kind).toBe('map');
      expect(flags.candidates).toHaveLength(2);
      centres.forEach(([x, y], k) => {
        const c = flags.candidates[k];
        // The peak pixel lies within half a pixel of the blob's centre on each axis, and the
        // 3 x 3 centroid around it stays within that pixel: half a pixel, 0.05".
        expect(Math.abs(c.xArcsec - x)).toBeLessThan(scale / 2);
        expect(Math.abs(c.yArcsec - y)).toBeLessThan(scale / 2);
      });
      expect(flags.candidates[0].score!).toBeGreaterThan(flags.candidates[1].score!);
    });
  }

  it('leaves out a blob below the threshold, and keeps it when the threshold is lowered', () => {
    const path = writeMapFits('faint.fits', blobs([[0.5, 0.5, 0.9], [-0.8, -0.6, 0.4]], 0.12));
    expect(readFlags(path, data).candidates).toHaveLength(1);
    expect(readFlags(path, data, { threshold: 0.3, mergeRadiusArcsec: 0.15 }).candidates).toHaveLength(2);
  });

  it('merges two peaks closer than the merge radius into the higher one', () => {
    // Peaks 0.3" apart at pixel centres with sigma 0.06": two distinct maxima.
    const path = writeMapFits('close.fits', blobs([[0.05, 0.05, 0.9], [0.35, 0.05, 0.8]], 0.06));
    expect(readFlags(path, data, { threshold: 0.5, mergeRadiusArcsec: 0.15 }).candidates).toHaveLength(2);
    const merged = readFlags(path, data, { threshold: 0.5, mergeRadiusArcsec: 0.4 }).candidates;
    expect(merged).toHaveLength(1);
    expect(merged[0].score).toBeCloseTo(0.9, 2);
  });

  it('gives no candidates, without an error, when no value reaches the threshold, and says so', () => {
    // Nothing flagged is a valid answer for a survey (arcsift's own contract).
    const path = writeMapFits('flat-prior.fits', new Float64Array(columns * rows).fill(0.2));
    const flags = readFlags(path, data, { threshold: 0.5, mergeRadiusArcsec: 0.15 });
    expect(flags.candidates).toEqual([]);
    expect(flags.notices).toEqual(['no candidates: no map value inside the mask reaches the threshold 0.5 (the highest is 0.2); nothing to vet']);
  });

  it('ignores maxima outside the mask', () => {
    const mask = new Uint8Array(columns * rows).fill(1);
    for (let j = 0; j < rows; j++) for (let i = 0; i < columns / 2; i++) mask[i + columns * j] = 0;
    const flags = readFlags(writeMapFits('masked.fits', map), { ...data, mask });
    expect(flags.candidates).toHaveLength(1);
    expect(flags.candidates[0].xArcsec).toBeGreaterThan(0);
  });

  const bad: [string, () => string, RegExp][] = [
    ['a FITS map of the wrong shape', () => writeMapFits('small.fits', new Float64Array(39 * 30), 39, 30), /expected 40 x 30 pixels \(columns x rows\).*found 39 x 30/],
    ['an NPY map of the wrong shape', () => writeMapNpy('transposed.npy', new Float64Array(30 * 40), 30, 40), /expected numpy shape \(30, 40\).*found numpy shape \(40, 30\)/],
    ['a value above 1', () => { const m = blobs([[0, 0, 0.9]], 0.1); m[7 + columns * 3] = 1.5; return writeMapFits('above.fits', m); }, /pixel \(7, 3\) \(column, row, counted from 0\): .*expected a probability in \[0, 1\], found 1.5/],
    ['a NaN value in the mask', () => { const m = blobs([[0, 0, 0.9]], 0.1); m[2 + columns * 9] = Number.NaN; return writeMapNpy('nan.npy', m); }, /pixel \(2, 9\) \(column, row, counted from 0\): .*found NaN/],
  ];
  for (const [what, make, message] of bad) {
    it(`rejects ${what}, naming the file`, () => {
      const path = make();
      let error: unknown;
      try { readFlags(path, data); } catch (e) { error = e; }
      expect(error).toBeInstanceOf(InputError);
      expect((error as InputError).place.file).toBe(path);
      expect((error as Error).message).toMatch(message);
    });
  }
});
