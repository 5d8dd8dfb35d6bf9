// The adaptive mesh's vertices (src/inversion/vertexSelection.ts: traced image pixels of a fixed
// lattice, Vegetti & Koopmans 2009): checked against what the config asks of them and against
// the geometry of the trade: with no lens (beta = theta) they are pixel centres spread over the
// field; under an isothermal ellipsoid the images near the critical curve are magnified, so their
// vertices crowd in the source plane near the caustic (common practice: the point of
// magnification-adapted meshes); and they move continuously with the lens.
import { describe, expect, it } from 'vitest';
import { pixelGrid } from '../../src/imaging/pixelGrid.js';
import { VertexSelection } from '../../src/inversion/vertexSelection.js';
import { isothermalEllipsoid } from '../../src/lens/isothermalEllipsoid/isothermalEllipsoid.js';

const grid = pixelGrid(60, 60, 0.05);
const annulus = Int32Array.from({ length: 3600 }, (_, p) => p).filter((p) => {
  const x = ((p % 60) - 29.5) * 0.05, y = (Math.floor(p / 60) - 29.5) * 0.05;
  const r = Math.hypot(x, y);
  return r > 0.4 && r < 1.4;
});
// Einstein radius 0.9", axis ratio 0.8, angle 30 deg, centre (0.02, -0.01), no core.
const lens = [{ profile: isothermalEllipsoid, offset: 0 }];
const p = Float64Array.of(0.9, 0.8, 30, 0.02, -0.01, 0);

describe('vertices of the adaptive source mesh', () => {
  it('keeps exactly as many vertices as asked, for several counts', () => {
    for (const wanted of [150, 400, 900]) {
      const v = new VertexSelection(grid, annulus, wanted);
      v.select(lens, p);
      expect(v.count).toBe(wanted);
    }
  });

  it('moves the vertices continuously with the lens (a small change moves none far)', () => {
    const v = new VertexSelection(grid, annulus, 300);
    v.select(lens, p);
    const x0 = Float64Array.from(v.x), y0 = Float64Array.from(v.y);
    v.select(lens, Float64Array.of(0.9 + 1e-6, 0.8, 30, 0.02, -0.01, 0));
    let worst = 0;
    for (let i = 0; i < v.count; i++) worst = Math.max(worst, Math.hypot(v.x[i] - x0[i], v.y[i] - y0[i]));
    // The deflection of an isothermal ellipsoid is proportional to its Einstein radius (Kormann,
    // Schneider & Bartelmann 1994): a change of 1e-6" moves every traced point by at most ~1e-6".
    expect(worst).toBeLessThan(2e-6);
  });

  it('gives the same vertices for the same lens (a function of the parameters)', () => {
    const a = new VertexSelection(grid, annulus, 300);
    const b = new VertexSelection(grid, annulus, 300);
    a.select(lens, p);
    b.select(lens, Float64Array.of(1.0, 0.7, 10, 0, 0, 0));
    b.select(lens, p);
    expect(b.count).toBe(a.count);
    expect(Array.from(b.x.subarray(0, b.count))).toEqual(Array.from(a.x.subarray(0, a.count)));
  });

  it('picks pixel centres at least a common spacing apart when there is no lens', () => {
    const v = new VertexSelection(grid, annulus, 300);
    v.select([], new Float64Array(0));
    let nearest = Infinity;
    for (let i = 0; i < v.count; i++) {
      // Each vertex is a pixel centre.
      expect(Math.abs(v.x[i] / 0.05 + 29.5 - Math.round(v.x[i] / 0.05 + 29.5))).toBeLessThan(1e-9);
      for (let j = 0; j < i; j++) nearest = Math.min(nearest, Math.hypot(v.x[i] - v.x[j], v.y[i] - v.y[j]));
    }
    // A Poisson-disc subset of `used` points with `count` kept has spacing of order sqrt(used / count) pixels.
    expect(nearest).toBeGreaterThan(0.5 * Math.sqrt(annulus.length / v.count) * 0.05);
  });

  it('crowds vertices near the caustic, where the images are most magnified', () => {
    const v = new VertexSelection(grid, annulus, 400);
    v.select(lens, p);
    // Nearest-neighbour distance of each vertex against its distance from the lens's source-plane centre:
    // the inner third (near the diamond caustic) has closer neighbours than the outer third.
    const radius = Array.from({ length: v.count }, (_, i) => Math.hypot(v.x[i], v.y[i]));
    const spacing = radius.map((_, i) => {
      let best = Infinity;
      for (let j = 0; j < v.count; j++) if (j !== i) best = Math.min(best, Math.hypot(v.x[i] - v.x[j], v.y[i] - v.y[j]));
      return best;
    });
    const byRadius = radius.map((r, i) => [r, spacing[i]]).sort((a, b) => a[0] - b[0]);
    const third = Math.floor(v.count / 3);
    const mean = (rows: number[][]): number => rows.reduce((s, r) => s + r[1], 0) / rows.length;
    expect(mean(byRadius.slice(0, third))).toBeLessThan(0.7 * mean(byRadius.slice(-third)));
  });

  it('gives the bright pixels their share of the vertices, on a finer lattice', () => {
    // An arc-like band of the annulus (x > 0.3") as the bright pixels.
    const bright = annulus.filter((q) => ((q % 60) - 29.5) * 0.05 > 0.3);
    const brightSet = new Set(bright);
    for (const share of [0.3, 0.6]) {
      const v = new VertexSelection(grid, annulus, 400, { pixels: bright, share });
      v.select([], new Float64Array(0));
      expect(v.count).toBe(400);
      let onBright = 0;
      for (let i = 0; i < v.count; i++) {
        const pixel = Math.round(v.y[i] / 0.05 + 29.5) * 60 + Math.round(v.x[i] / 0.05 + 29.5);
        if (brightSet.has(pixel)) onBright++;
      }
      expect(onBright).toBe(Math.round(share * 400));
      expect(v.brightCount).toBe(onBright);
    }
    // With 60% of the vertices on about a quarter of the pixels, the bright band's vertices sit
    // closer together than the others (a lattice's spacing goes as sqrt(pixels / vertices)).
    const v = new VertexSelection(grid, annulus, 400, { pixels: bright, share: 0.6 });
    v.select([], new Float64Array(0));
    const isBright = (i: number): boolean => v.x[i] > 0.3;
    const nearest = (i: number): number => {
      let best = Infinity;
      for (let j = 0; j < v.count; j++) if (j !== i && isBright(j) === isBright(i)) best = Math.min(best, Math.hypot(v.x[i] - v.x[j], v.y[i] - v.y[j]));
      return best;
    };
    const meanSpacing = (want: boolean): number => {
      const list = Array.from({ length: v.count }, (_, i) => i).filter((i) => isBright(i) === want);
      return list.reduce((sum, i) => sum + nearest(i), 0) / list.length;
    };
    const expectedRatio = Math.sqrt((bright.length / 240) / ((annulus.length - bright.length) / 160));
    expect(meanSpacing(true) / meanSpacing(false)).toBeGreaterThan(0.7 * expectedRatio);
    expect(meanSpacing(true) / meanSpacing(false)).toBeLessThan(1.3 * expectedRatio);
  });

  it('gives the other pixels what the bright ones cannot hold, and ignores a zero share', () => {
    const few = annulus.slice(0, 50);
    const v = new VertexSelection(grid, annulus, 300, { pixels: few, share: 0.5 });
    expect(v.count).toBe(300);
    // Half of 300 asked of 50 bright pixels: all 50 become vertices, the others' lattice takes 250.
    expect(v.brightCount).toBe(50);
    const plain = new VertexSelection(grid, annulus, 300);
    const none = new VertexSelection(grid, annulus, 300, { pixels: few, share: 0 });
    plain.select(lens, p);
    none.select(lens, p);
    expect(Array.from(none.x)).toEqual(Array.from(plain.x));
  });
});
