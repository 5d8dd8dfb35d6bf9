import { describe, expect, it } from 'vitest';
import { MapPositionPrior } from '../../src/vet/mapPositionPrior.js';
import { InputError } from '../../src/errors.js';

// The conditional inverse-CDF transform (Rosenblatt 1952) must turn the uniform distribution on
// the unit square into the map's distribution: each pixel is reached with its normalised
// probability and positions are uniform within it. Checked exactly on a stratified lattice of
// unit-square points, for which the fraction landing in a pixel equals its probability up to
// the lattice's resolution (1/K per axis, K = 600: every probability here is a multiple of
// 1/20 of a row share, so the lattice resolves it to within 2/K).
const grid = { columns: 4, rows: 3, pixelScaleArcsec: 0.5 };
const values = Float64Array.from([
  0.0, 0.2, 0.4, 0.0,
  0.0, 0.0, 0.0, 0.0,
  0.1, 0.0, 0.9, 0.6,
]);
const mask = Uint8Array.from([
  1, 1, 1, 1,
  1, 1, 1, 1,
  1, 1, 1, 0,
]);

describe('MapPositionPrior', () => {
  const prior = new MapPositionPrior({ file: 'map.fits', values, columns: 4, rows: 3 }, mask, grid);

  it('normalises the map over the mask (the masked-out 0.6 does not count)', () => {
    const total = 0.2 + 0.4 + 0.1 + 0.9;
    expect(prior.probability[2]).toBeCloseTo(0.4 / total, 14);
    expect(prior.probability[11]).toBe(0);
    expect(prior.probability.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 14);
  });

  it('reaches each pixel with its probability, never a zero-probability one, uniformly inside it', () => {
    const k = 600;
    const counts = new Float64Array(12);
    const out = new Float64Array(2);
    const inside: number[] = [];
    for (let a = 0; a < k; a++) {
      for (let b = 0; b < k; b++) {
        prior.fromUnit((a + 0.5) / k, (b + 0.5) / k, out, 0, 1);
        // Pixel (i, j) spans x in [(i - 2) * 0.5, (i - 1) * 0.5) (centre (i - 1.5) * 0.5), likewise y with (rows - 1) / 2 = 1.
        const i = Math.floor(out[0] / 0.5 + 2);
        const j = Math.floor(out[1] / 0.5 + 1.5);
        counts[i + 4 * j] += 1 / (k * k);
        if (i === 2 && j === 2) inside.push(out[0] / 0.5 + 2 - i);
      }
    }
    for (let p = 0; p < 12; p++) expect(Math.abs(counts[p] - prior.probability[p]), `pixel ${p}`).toBeLessThan(2 / k);
    // Within pixel (2, 2) the x offset is uniform: its mean is 1/2 and its variance 1/12 (to the lattice resolution).
    const mean = inside.reduce((s, v) => s + v, 0) / inside.length;
    const variance = inside.reduce((s, v) => s + (v - mean) ** 2, 0) / inside.length;
    expect(mean).toBeCloseTo(0.5, 2);
    expect(variance).toBeCloseTo(1 / 12, 2);
  });

  it('maps the corners of the unit square into (the closed squares of) pixels of positive probability', () => {
    const out = new Float64Array(2);
    for (const [u, v] of [[0, 0], [1, 1], [0, 1], [1, 0]]) {
      prior.fromUnit(u, v, out, 0, 1);
      const pi = out[0] / 0.5 + 2;
      const pj = out[1] / 0.5 + 1.5;
      let inPositive = false;
      for (let j = 0; j < 3; j++) {
        for (let i = 0; i < 4; i++) {
          if (prior.probability[i + 4 * j] > 0 && pi >= i && pi <= i + 1 && pj >= j && pj <= j + 1) inPositive = true;
        }
      }
      expect(inPositive, `(${u}, ${v}) -> (${out[0]}, ${out[1]})`).toBe(true);
    }
  });

  it('spans the bounding box of the positive pixels, at their edges', () => {
    expect(prior.bounds).toEqual({ xMin: -1.0, xMax: 0.5, yMin: -0.75, yMax: 0.75 });
  });

  it('rejects a map with no probability inside the mask', () => {
    expect(() => new MapPositionPrior({ file: 'zero.fits', values: new Float64Array(12), columns: 4, rows: 3 }, mask, grid)).toThrow(InputError);
  });
});
