// Tests of src/numeric/geometry/barycentricWeights.ts against scipy.spatial.Delaunay.transform.
import { describe, expect, it } from 'vitest';
import { barycentricWeights, DelaunayTriangulation } from '../../../src/numeric/geometry/index.js';
import { delaunayCases, triangulate, type DelaunayCase } from './delaunayFixture.js';

const EPS = 2 ** -52;

/**
 * Weights agree with scipy's to 1e-12. Both solve the same 2x2 system T c = q - r from exactly
 * rounded coordinate differences, scipy through LAPACK's LU and this code through the explicit
 * inverse; each is off by a small multiple of cond(T) eps (the perturbation bound for linear
 * systems, e.g. Higham 2002, Accuracy and Stability of Numerical Algorithms, ch. 7), so 1e-12
 * allows 10 cond(T) eps up to cond(T) = 450. The fixture's conditions stay below that (checked).
 */
const SCIPY_WEIGHT_TOLERANCE = 1e-12;
const LARGEST_CONDITION_COVERED = 450;

interface Batch {
  vertices: Int32Array;
  weights: Float64Array;
  outside: number;
}

function weighCase(triangulation: DelaunayTriangulation, c: DelaunayCase): Batch {
  const n = c.queryX.length;
  const vertices = new Int32Array(3 * n);
  const weights = new Float64Array(3 * n).fill(Number.NaN);
  const outside = barycentricWeights(triangulation, Float64Array.from(c.queryX), Float64Array.from(c.queryY), n, vertices, weights);
  return { vertices, weights, outside };
}

describe('barycentricWeights', () => {
  for (const c of delaunayCases) {
    it(`${c.name}: scipy's vertices and weights to ${SCIPY_WEIGHT_TOLERANCE}, -1 and 0 outside`, () => {
      const { vertices, weights, outside } = weighCase(triangulate(c), c);
      expect(outside).toBe(c.queryVertices.filter((v) => v === null).length);
      for (let q = 0; q < c.queryX.length; q++) {
        const got = Array.from(vertices.subarray(3 * q, 3 * q + 3));
        const expectedVertices = c.queryVertices[q];
        const expectedWeights = c.queryWeights[q];
        if (expectedVertices === null || expectedWeights === null) {
          expect(got).toEqual([-1, -1, -1]);
          expect(Array.from(weights.subarray(3 * q, 3 * q + 3))).toEqual([0, 0, 0]);
          continue;
        }
        expect(c.queryConditionNumbers[q]).toBeLessThanOrEqual(LARGEST_CONDITION_COVERED);
        expect([...got].sort((a, b) => a - b)).toEqual([...expectedVertices].sort((a, b) => a - b));
        for (let k = 0; k < 3; k++) {
          const mine = weights[3 * q + got.indexOf(expectedVertices[k])];
          expect(Math.abs(mine - expectedWeights[k]), `query ${q}, vertex ${expectedVertices[k]}`).toBeLessThanOrEqual(SCIPY_WEIGHT_TOLERANCE);
        }
      }
    });

    it(`${c.name}: weights sum to 1 and reproduce a linear function (common practice)`, () => {
      const { vertices, weights } = weighCase(triangulate(c), c);
      // f = a + b x + c y, a made-up plane.
      const [a, b, d] = [0.3, 1.7, -2.2];
      const f = (x: number, y: number): number => a + b * x + d * y;
      for (let q = 0; q < c.queryX.length; q++) {
        const condition = c.queryConditionNumbers[q];
        if (condition === null) continue;
        const w = weights.subarray(3 * q, 3 * q + 3);
        const v = vertices.subarray(3 * q, 3 * q + 3);
        // w2 = 1 - w0 - w1 and the sum: four roundings of numbers of size <= 2.
        expect(Math.abs(w[0] + w[1] + w[2] - 1)).toBeLessThanOrEqual(4 * EPS);
        let interpolated = 0;
        let size = 0;
        for (let k = 0; k < 3; k++) {
          interpolated += w[k] * f(c.x[v[k]], c.y[v[k]]);
          const next = v[(k + 1) % 3];
          size = Math.max(size, Math.hypot(c.x[next] - c.x[v[k]], c.y[next] - c.y[v[k]]));
        }
        // The solve's residual T c - (q - r) is of order cond(T) eps times the triangle's size,
        // carried by the gradient; the sums round at eps times the magnitudes added.
        const fq = f(c.queryX[q], c.queryY[q]);
        const bound = 4 * EPS * (condition * size * (Math.abs(b) + Math.abs(d)) + Math.abs(a) + 3 * Math.abs(fq) + 1);
        expect(Math.abs(interpolated - fq), `query ${q}`).toBeLessThanOrEqual(bound);
      }
    });
  }

  it('finds points on vertices and edges of an exact square grid inside, with weights that reproduce x and y', () => {
    // A raster at a quarter of the grid spacing lands on vertices, on grid lines (shared edges)
    // and on cell diagonals: inside the hull, each must be found (common practice) with weights
    // in [-100 eps, 1 + 100 eps] that give back its position within rounding.
    const [m, s] = [12, 0.25];
    const x = new Float64Array(m * m);
    const y = new Float64Array(m * m);
    for (let k = 0; k < m * m; k++) {
      x[k] = (k % m) * s;
      y[k] = Math.floor(k / m) * s;
    }
    const triangulation = new DelaunayTriangulation();
    triangulation.rebuild(x, y);
    const side = 4 * (m - 1) + 1;
    const n = side * side;
    const qx = Float64Array.from({ length: n }, (_, k) => (k % side) * (s / 4));
    const qy = Float64Array.from({ length: n }, (_, k) => Math.floor(k / side) * (s / 4));
    const vertices = new Int32Array(3 * n);
    const weights = new Float64Array(3 * n);
    expect(barycentricWeights(triangulation, qx, qy, n, vertices, weights)).toBe(0);
    expect(triangulation.walkFallbacks).toBe(0);
    for (let q = 0; q < n; q++) {
      let px = 0;
      let py = 0;
      for (let k = 0; k < 3; k++) {
        const w = weights[3 * q + k];
        expect(w).toBeGreaterThanOrEqual(-100 * EPS);
        expect(w).toBeLessThanOrEqual(1 + 100 * EPS);
        px += w * x[vertices[3 * q + k]];
        py += w * y[vertices[3 * q + k]];
      }
      // Coordinates up to 2.75, exact in binary: the rounding of the solve and of the sums.
      expect(Math.abs(px - qx[q])).toBeLessThanOrEqual(16 * EPS * 2.75);
      expect(Math.abs(py - qy[q])).toBeLessThanOrEqual(16 * EPS * 2.75);
    }
  });

  it('gives each point the same answer in any query order (the hint only speeds the search)', () => {
    const c = delaunayCases[2];
    const triangulation = triangulate(c);
    const forward = weighCase(triangulation, c);
    const n = c.queryX.length;
    const order = Array.from({ length: n }, (_, k) => (k * 7919) % n);
    const vertices = new Int32Array(3 * n);
    const weights = new Float64Array(3 * n);
    const qx = Float64Array.from(order, (k) => c.queryX[k]);
    const qy = Float64Array.from(order, (k) => c.queryY[k]);
    expect(barycentricWeights(triangulation, qx, qy, n, vertices, weights)).toBe(forward.outside);
    for (let i = 0; i < n; i++) {
      for (let k = 0; k < 3; k++) {
        expect(vertices[3 * i + k]).toBe(forward.vertices[3 * order[i] + k]);
        expect(weights[3 * i + k]).toBe(forward.weights[3 * order[i] + k]);
      }
    }
  });

  it('reports every point outside when the triangulation failed, and refuses short buffers', () => {
    const c = delaunayCases[0];
    const triangulation = new DelaunayTriangulation();
    triangulation.rebuild(Float64Array.from([0, 1, 2, 3]), Float64Array.from([1, 1, 1, 1]));
    const { vertices, weights, outside } = weighCase(triangulation, c);
    expect(outside).toBe(c.queryX.length);
    expect(vertices.every((v) => v === -1)).toBe(true);
    expect(weights.every((w) => w === 0)).toBe(true);
    const n = c.queryX.length;
    const qx = Float64Array.from(c.queryX);
    expect(() => barycentricWeights(triangulation, qx, qx, n, new Int32Array(3 * n - 1), new Float64Array(3 * n))).toThrow(RangeError);
    expect(() => barycentricWeights(triangulation, qx, qx, n, new Int32Array(3 * n), new Float64Array(3 * n - 1))).toThrow(RangeError);
    expect(() => barycentricWeights(triangulation, qx, qx, n + 1, new Int32Array(3 * n + 3), new Float64Array(3 * n + 3))).toThrow(RangeError);
  });
});
