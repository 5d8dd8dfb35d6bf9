import { describe, expect, it } from 'vitest';
import { AdaptiveMesh } from '../../src/inversion/adaptiveMesh.js';
import { MAX_NATURAL_NEIGHBOURS } from '../../src/numeric/geometry/naturalNeighbourWeights.js';

// A ray whose natural-neighbour ring is degenerate takes its triangle's barycentric weights, and
// the mesh counts it. Common practice (Bowyer 1981, Watson 1981): a query at the centre of
// cocircular vertices lies inside every one of their triangles' circumcircles, so all of them
// are its natural neighbours; with more than MAX_NATURAL_NEIGHBOURS of them it falls back.
describe('interpolation fallbacks of a source mesh', () => {
  it('counts the rays of a crowded ring, and only those, call by call', () => {
    // A ring of cocircular vertices of radius 1 inside a ring of 7 vertices of radius 3.
    const ring = MAX_NATURAL_NEIGHBOURS + 8;
    const count = ring + 7;
    const vx = new Float64Array(count), vy = new Float64Array(count);
    for (let k = 0; k < ring; k++) {
      vx[k] = Math.cos((2 * Math.PI * k) / ring);
      vy[k] = Math.sin((2 * Math.PI * k) / ring);
    }
    for (let k = 0; k < 7; k++) {
      vx[ring + k] = 3 * Math.cos((2 * Math.PI * (k + 0.3)) / 7);
      vy[ring + k] = 3 * Math.sin((2 * Math.PI * (k + 0.3)) / 7);
    }
    const mesh = new AdaptiveMesh();
    mesh.build(vx, vy, count);
    const per = mesh.entriesPerRay;
    // The centre (the crowded ring), a point between the rings (a few neighbours), one outside.
    const bx = Float64Array.of(0, 1.8, 5), by = Float64Array.of(0, 0.1, 0);
    const cells = new Int32Array(3 * per), weights = new Float64Array(3 * per);
    expect(mesh.interpolate(bx, by, 3, cells, weights)).toBe(1);
    expect(mesh.interpolationFallbacks).toBe(1);
    // The fallback's weights are its triangle's: three cells, summing to 1, reproducing x and y.
    const used = Array.from(cells.subarray(0, per)).filter((c) => c >= 0);
    expect(used.length).toBe(3);
    let sum = 0, x = 0, y = 0;
    for (let e = 0; e < 3; e++) {
      sum += weights[e];
      x += weights[e] * vx[cells[e]];
      y += weights[e] * vy[cells[e]];
    }
    expect(sum).toBeCloseTo(1, 12);
    expect(Math.abs(x) + Math.abs(y)).toBeLessThan(1e-12);
    // The next call counts afresh.
    expect(mesh.interpolate(bx.subarray(1), by.subarray(1), 2, cells, weights)).toBe(1);
    expect(mesh.interpolationFallbacks).toBe(0);
  });
});
