import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { PrincipalAxisOrder, sortByKey } from '../../../src/numeric/sparse/principalAxisOrder.js';
import { uniformStream } from './sparseTestMatrices.js';

describe('sortByKey', () => {
  // Reference: Array.prototype.sort with the same total order (key, then index).
  it('sorts by key, ties by index, as the engine sort does', () => {
    const u = uniformStream(71);
    for (const [n, distinct] of [[0, 1], [1, 1], [2, 2], [7, 3], [64, 5], [301, 1000], [500, 2]]) {
      const key = Float64Array.from({ length: n }, () => Math.floor(u() * distinct) - distinct / 2);
      const items = Int32Array.from({ length: n }, (_, i) => i);
      sortByKey(items, n, key);
      const expected = Array.from({ length: n }, (_, i) => i).sort((a, b) => key[a] - key[b] || a - b);
      expect(Array.from(items), `${n} items, ${distinct} keys`).toEqual(expected);
    }
  });
});

describe('PrincipalAxisOrder', () => {
  /** An elongated cloud: `count` points along angle `angle`, spread 1 across and 5 along. */
  function cloud(count: number, angle: number, seed: number): { x: Float64Array; y: Float64Array; count: number } {
    const u = uniformStream(seed);
    const x = new Float64Array(count), y = new Float64Array(count);
    for (let v = 0; v < count; v++) {
      const along = 10 * (u() - 0.5), across = 2 * (u() - 0.5);
      x[v] = 0.3 + along * Math.cos(angle) - across * Math.sin(angle);
      y[v] = -1.2 + along * Math.sin(angle) + across * Math.cos(angle);
    }
    return { x, y, count };
  }

  // Reference: ml-matrix's EigenvalueDecomposition of the 2 x 2 scatter matrix; the projections
  // on its leading eigenvector must come out sorted (up to the eigenvector's sign).
  it('sorts the points along the leading eigenvector of their scatter matrix', () => {
    for (const [angle, seed] of [[0.4, 3], [-1.2, 5], [2.0, 8], [Math.PI / 2, 13]]) {
      const points = cloud(400, angle, seed);
      let mx = 0, my = 0;
      for (let v = 0; v < points.count; v++) {
        mx += points.x[v];
        my += points.y[v];
      }
      mx /= points.count;
      my /= points.count;
      let sxx = 0, syy = 0, sxy = 0;
      for (let v = 0; v < points.count; v++) {
        const dx = points.x[v] - mx, dy = points.y[v] - my;
        sxx += dx * dx;
        syy += dy * dy;
        sxy += dx * dy;
      }
      const eig = new EigenvalueDecomposition(new Matrix([[sxx, sxy], [sxy, syy]]));
      const values = eig.realEigenvalues;
      const leading = values[0] > values[1] ? 0 : 1;
      const ex = eig.eigenvectorMatrix.get(0, leading), ey = eig.eigenvectorMatrix.get(1, leading);
      const order = new PrincipalAxisOrder().order(points, new Int32Array(points.count + 2), [points.count, points.count + 1]);
      const projection = Array.from(order.subarray(0, points.count), (v) => points.x[v] * ex + points.y[v] * ey);
      const sign = projection[projection.length - 1] >= projection[0] ? 1 : -1;
      for (let k = 1; k < projection.length; k++) expect(sign * (projection[k] - projection[k - 1]), `angle ${angle}, position ${k}`).toBeGreaterThanOrEqual(-1e-12);
      expect(Array.from(order.subarray(points.count))).toEqual([points.count, points.count + 1]);
      expect(Array.from(order).sort((a, b) => a - b)).toEqual(Array.from({ length: points.count + 2 }, (_, i) => i));
    }
  });

  // Common practice: a profile ordering keeps the couplings of nearby points near the diagonal.
  // Points coupled within distance 1 along a 5:1 cloud: the widest band of the sweep is a small
  // part of that of the points' given (random) order.
  it('keeps nearby points near each other in the order', () => {
    const points = cloud(600, 0.7, 21);
    const order = new PrincipalAxisOrder().order(points, new Int32Array(points.count), []);
    const position = new Int32Array(points.count);
    order.forEach((v, k) => (position[v] = k));
    let widest = 0, widestGiven = 0;
    for (let a = 0; a < points.count; a++) {
      for (let b = 0; b < a; b++) {
        if (Math.hypot(points.x[a] - points.x[b], points.y[a] - points.y[b]) > 1) continue;
        widest = Math.max(widest, Math.abs(position[a] - position[b]));
        widestGiven = Math.max(widestGiven, a - b);
      }
    }
    expect(widest).toBeLessThan(0.35 * points.count);
    expect(widestGiven).toBeGreaterThan(0.9 * points.count);
  });
});
