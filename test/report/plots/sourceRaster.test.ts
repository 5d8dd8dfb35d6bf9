import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { InputError } from '../../../src/errors.js';
import { readSourceFile } from '../../../src/records/readSourceFile.js';
import type { SourceFile } from '../../../src/records/sourceFile.js';
import { meshEdges, rasterizeSource, significantWindowOf, sourceWindowOf } from '../../../src/report/plots/sourceRaster.js';

// Natural-neighbour interpolation (Sukumar et al. 2001) and bilinear interpolation on a grid
// (e.g. Press et al. 2007, Numerical Recipes sec. 3.6) both reproduce an affine function exactly, so a
// source whose cells hold a plane must come back as that plane at every raster cell on the mesh.
const plane = (x: number, y: number): number => 2 + 3 * x - 5 * y;

function regularSource(side: number): SourceFile {
  const x: number[] = [], y: number[] = [];
  for (let b = 0; b < side; b++) for (let a = 0; a < side; a++) { x.push(-0.5 + a * (1 / (side - 1))); y.push(0.1 + b * (1 / (side - 1))); }
  return { mesh: 'regular', regularisation: 'gradient', cellXArcsec: x, cellYArcsec: y, values: x.map((v, k) => plane(v, y[k])), standardDeviations: x.map(() => 0.5), triangles: null, side, raysOutside: 0 };
}

function adaptiveSource(): SourceFile {
  // Scattered points from a fixed sequence (a Halton-like pattern): no library triangulation is needed to know the answer.
  const x: number[] = [], y: number[] = [];
  for (let k = 1; k <= 60; k++) { x.push(((k * 0.618034) % 1) - 0.5); y.push(((k * 0.754878) % 1) - 0.5); }
  return { mesh: 'adaptive', regularisation: 'curvature', cellXArcsec: x, cellYArcsec: y, values: x.map((v, k) => plane(v, y[k])), standardDeviations: x.map(() => 1), triangles: [], side: null, raysOutside: 0 };
}

describe('rasterised source reconstructions (report)', () => {
  it('gives back a plane on a regular mesh (bilinear) and marks off-mesh cells', () => {
    const source = regularSource(9);
    const window = { centreX: 0, centreY: 0.6, half: 0.7 };
    const r = rasterizeSource(source, window, 40);
    let on = 0;
    for (let j = 0; j < 40; j++) {
      for (let i = 0; i < 40; i++) {
        const p = j * 40 + i;
        const x = -0.7 + (i + 0.5) * (1.4 / 40);
        const y = 0.6 - 0.7 + (j + 0.5) * (1.4 / 40);
        const inside = x >= -0.5 && x <= 0.5 && y >= 0.1 && y <= 1.1;
        expect(r.outside[p]).toBe(inside ? 0 : 1);
        if (inside) { on++; expect(r.values[p]).toBeCloseTo(plane(x, y), 10); expect(r.standardDeviations[p]).toBeCloseTo(0.5, 12); }
      }
    }
    expect(on).toBeGreaterThan(500);
    // A 9-node side has 9 horizontal and 9 vertical lines.
    expect(meshEdges(source).length).toBe(4 * 18);
  });

  it('gives back a plane on an adaptive mesh (natural-neighbour weights reproduce linear functions)', () => {
    const source = adaptiveSource();
    const window = sourceWindowOf(source);
    const r = rasterizeSource(source, window, 50);
    let on = 0;
    for (let p = 0; p < r.values.length; p++) {
      if (r.outside[p] === 1) continue;
      on++;
      const i = p % 50, j = Math.floor(p / 50);
      const x = window.centreX - window.half + (i + 0.5) * (2 * window.half / 50);
      const y = window.centreY - window.half + (j + 0.5) * (2 * window.half / 50);
      expect(r.values[p]).toBeCloseTo(plane(x, y), 9);
    }
    expect(on).toBeGreaterThan(1000);
  });

  it('zooms on the cells the data hold, inside the mesh window', () => {
    const source = { ...regularSource(9), values: regularSource(9).values.map((_, k) => (k === 40 ? 10 : 0)) };
    const zoom = significantWindowOf(source, 5);
    const whole = sourceWindowOf(source);
    expect(zoom.half).toBeLessThan(whole.half);
    expect(zoom.half).toBeGreaterThanOrEqual(0.2 * whole.half - 1e-12);
    // Cell 40 is the middle node (4, 4) at (0, 0.6).
    expect(zoom.centreX).toBeCloseTo(0, 12);
    expect(zoom.centreY).toBeCloseTo(0.6, 12);
    expect(significantWindowOf({ ...source, values: source.values.map(() => 0) }, 5)).toEqual(whole);
  });

  it('refuses a damaged source.json naming the key', () => {
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-source-'));
    const file = join(folder, 'source.json');
    writeFileSync(file, JSON.stringify({ ...regularSource(3), values: [1, 2] }));
    expect(() => readSourceFile(file)).toThrow(InputError);
    expect(() => readSourceFile(file)).toThrow(/values/);
    writeFileSync(file, JSON.stringify(regularSource(3)));
    expect(readSourceFile(file).side).toBe(3);
    // An adaptive mesh's bright cells: read back as written, a damaged record named.
    writeFileSync(file, JSON.stringify({ ...adaptiveSource(), brightCells: { count: 4, signalToNoise: 10 } }));
    expect(readSourceFile(file).brightCells).toEqual({ count: 4, signalToNoise: 10 });
    writeFileSync(file, JSON.stringify({ ...adaptiveSource(), brightCells: { count: '4' } }));
    expect(() => readSourceFile(file)).toThrow(/brightCells/);
  });
});
