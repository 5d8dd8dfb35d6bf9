// The lensed and blurred mapping of a pixelated source (src/inversion/mappingMatrix.ts,
// blurredMapping.ts) against its definition (Warren & Dye 2003): column j of B is the image of
// cell j alone at unit value, averaged over each pixel's rays and convolved with the PSF by the
// direct convolution of src/imaging/directConvolution.ts (itself tested against the definition).
import { describe, expect, it } from 'vitest';
import { directConvolution } from '../../src/imaging/directConvolution.js';
import { pixelGrid } from '../../src/imaging/pixelGrid.js';
import { BlurredMapping } from '../../src/inversion/blurredMapping.js';
import { MappingMatrix } from '../../src/inversion/mappingMatrix.js';
import { RegularMesh } from '../../src/inversion/regularMesh.js';
import { SourceRays } from '../../src/inversion/sourceRays.js';
import { SparseRows } from '../../src/inversion/sparseRows.js';
import { SpreadMemory } from '../../src/inversion/spreadBlurKernel.js';
import { isothermalEllipsoid } from '../../src/lens/isothermalEllipsoid/isothermalEllipsoid.js';

describe('the blurred mapping matrix', () => {
  const grid = pixelGrid(14, 12, 0.1);
  const all = Int32Array.from({ length: 14 * 12 }, (_, p) => p);
  const used = all.filter((p) => (p % 14) > 2 && (p % 14) < 12 && Math.floor(p / 14) > 1 && Math.floor(p / 14) < 10);
  const rays = new SourceRays(grid, all, 2);
  // An isothermal ellipsoid (Einstein radius 0.4", q 0.8) maps the grid onto a small source region.
  const p = Float64Array.of(0.4, 0.8, 30, 0.05, -0.02, 0);
  rays.trace([{ profile: isothermalEllipsoid, offset: 0 }], p);
  const mesh = new RegularMesh(5);
  let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity;
  for (let t = 0; t < rays.count; t++) {
    xMin = Math.min(xMin, rays.betaX[t]); xMax = Math.max(xMax, rays.betaX[t]);
    yMin = Math.min(yMin, rays.betaY[t]); yMax = Math.max(yMax, rays.betaY[t]);
  }
  mesh.layOver(xMin, xMax, yMin, yMax);
  const cells = new Int32Array(4 * rays.count), weights = new Float64Array(4 * rays.count);
  mesh.interpolate(rays.betaX, rays.betaY, rays.count, cells, weights);
  const area = 0.01;
  const m = new SparseRows();
  new MappingMatrix().build(cells, weights, all.length, 4, 4, mesh.cellCount, area, m);
  // A kernel of no symmetry, and a separable one (the product of two profiles, as a Gaussian PSF
  // is), built both in one pass over its taps and in two one-dimensional passes (SeparableBlur).
  const general = { columns: 3, rows: 3, values: Float64Array.of(0.02, 0.1, 0.03, 0.12, 0.4, 0.1, 0.05, 0.1, 0.08) };
  const alongX = Float64Array.of(0.05, 0.15, 0.5, 0.2, 0.1), alongY = Float64Array.of(0.2, 0.5, 0.3);
  const product = { columns: 5, rows: 3, values: Float64Array.from({ length: 15 }, (_, k) => alongX[k % 5] * alongY[Math.floor(k / 5)]) };
  describe.each([
    ['a general kernel, one pass', general, undefined],
    ['a separable kernel, one pass', product, undefined],
    ['a separable kernel, two passes', product, { alongX, alongY }],
  ] as const)('with %s', (_, kernel, separable) => {
    const b = new SparseRows();
    const bt = new SparseRows();
    new BlurredMapping(14, 12, kernel, used, all, separable).build(m, mesh.cellCount, b, bt);

    it('holds, for every cell, the blurred image of that cell alone at the used pixels (to 1e-14)', () => {
      let worst = 0;
      for (let j = 0; j < mesh.cellCount; j++) {
        const image = new Float64Array(all.length);
        for (let q = 0; q < all.length; q++) {
          let sum = 0;
          for (let t = 4 * q; t < 4 * q + 4; t++) {
            for (let k = 0; k < 4; k++) if (cells[4 * t + k] === j) sum += weights[4 * t + k];
          }
          image[q] = (area * sum) / 4;
        }
        const blurred = new Float64Array(all.length);
        directConvolution(image, 14, 12, kernel, blurred);
        used.forEach((pixel, e) => {
          let entry = 0;
          for (let k = b.rowStart[e]; k < b.rowStart[e + 1]; k++) if (b.column[k] === j) entry = b.value[k];
          worst = Math.max(worst, Math.abs(entry - blurred[pixel]));
        });
      }
      expect(worst).toBeLessThan(1e-14);
    });

    it('maps a source of uniform brightness 1 to the pixel area in every pixel whose rays all land on the mesh', () => {
      // Bilinear weights sum to 1 (common practice), so each ray sees brightness 1 and each pixel
      // holds brightness x area before the PSF.
      for (let q = 0; q < all.length; q++) {
        let sum = 0;
        for (let k = m.rowStart[q]; k < m.rowStart[q + 1]; k++) sum += m.value[k];
        expect(Math.abs(sum - area)).toBeLessThan(1e-15);
      }
    });

    it('keeps each row of B in increasing cell order, each cell once', () => {
      for (let e = 0; e < b.rowCount; e++) {
        for (let k = b.rowStart[e] + 1; k < b.rowStart[e + 1]; k++) expect(b.column[k]).toBeGreaterThan(b.column[k - 1]);
      }
    });

    it('gives B^T with the same entries as B, cell by cell', () => {
      const fromB = new Map<string, number>();
      for (let e = 0; e < b.rowCount; e++) {
        for (let k = b.rowStart[e]; k < b.rowStart[e + 1]; k++) fromB.set(`${e},${b.column[k]}`, b.value[k]);
      }
      const fromBt = new Map<string, number>();
      for (let c = 0; c < bt.rowCount; c++) {
        for (let k = bt.rowStart[c]; k < bt.rowStart[c + 1]; k++) fromBt.set(`${bt.column[k]},${c}`, bt.value[k]);
      }
      expect(bt.rowCount).toBe(mesh.cellCount);
      expect(fromBt).toEqual(fromB);
    });
  });

  describe('the one-pass spread in WebAssembly', () => {
    // The same operations in the same order as the JavaScript loop: the rows must agree to the
    // bit; the JavaScript loop is checked against the definition above.
    const kernels = [['general', general], ['separable, one pass', product]] as const;
    it.each(kernels)('gives the JavaScript twin\'s B and B^T bit for bit (%s kernel)', (_, kernel) => {
      const rows = (['auto', 'javaScript'] as const).map((engine) => {
        const b = new SparseRows(), bt = new SparseRows();
        const mapping = new BlurredMapping(14, 12, kernel, used, all, undefined, engine);
        // Twice: the second call reuses the memory and its stamps.
        mapping.build(m, mesh.cellCount, b, bt);
        mapping.build(m, mesh.cellCount, b, bt);
        return [b, bt].map((r) => ({
          start: Array.from(r.rowStart.subarray(0, r.rowCount + 1)),
          column: Array.from(r.column.subarray(0, r.entries)),
          value: Array.from(r.value.subarray(0, r.entries)),
        }));
      });
      expect(rows[0]).toEqual(rows[1]);
      expect(rows[0][1].column.length).toBeGreaterThan(mesh.cellCount);
    });

    it('stops before a cell that might not fit, and a larger memory finishes with the same rows', () => {
      const mt = new SparseRows();
      mt.transposeOf(m, mesh.cellCount);
      const lists = { start: Int32Array.of(0, ...Array.from({ length: all.length }, (_, q) => q + 1)), pixel: Int32Array.from(all, (q) => q % used.length), tap: Float64Array.from(all, (q) => 0.5 + q / 1000) };
      const run = (out: number): { done: number; memory: SpreadMemory } => {
        const memory = new SpreadMemory(lists, used.length, 1, { cells: mesh.cellCount, entries: mt.entries, out });
        memory.mtStart.set(mt.rowStart.subarray(0, mesh.cellCount + 1));
        memory.mtPixel.set(mt.column.subarray(0, mt.entries));
        memory.mtValue.set(mt.value.subarray(0, mt.entries));
        return { done: memory.fill(mesh.cellCount), memory };
      };
      const small = run(40);
      const large = run(10 * mt.entries);
      expect(small.done).toBeGreaterThan(0);
      expect(small.done).toBeLessThan(mesh.cellCount);
      expect(large.done).toBe(mesh.cellCount);
      const end = small.memory.outStart[small.done];
      expect(end).toBeLessThanOrEqual(40);
      expect(Array.from(small.memory.outStart.subarray(0, small.done + 1))).toEqual(Array.from(large.memory.outStart.subarray(0, small.done + 1)));
      expect(Array.from(small.memory.outValue.subarray(0, end))).toEqual(Array.from(large.memory.outValue.subarray(0, end)));
      // Each row's values: cell c's entries of M^T times its taps, merged by used pixel.
      for (let c = 0; c < mesh.cellCount; c++) {
        const expected = new Map<number, number>();
        for (let k = mt.rowStart[c]; k < mt.rowStart[c + 1]; k++) {
          const q = mt.column[k];
          expected.set(q % used.length, (expected.get(q % used.length) ?? 0) + (0.5 + q / 1000) * mt.value[k]);
        }
        const got = new Map<number, number>();
        for (let k = large.memory.outStart[c]; k < large.memory.outStart[c + 1]; k++) got.set(large.memory.outColumn[k], large.memory.outValue[k]);
        expect([...got.keys()].sort((a, b) => a - b)).toEqual([...expected.keys()].sort((a, b) => a - b));
        for (const [e, v] of expected) expect(got.get(e)).toBeCloseTo(v, 12);
      }
    });
  });
});
