import { describe, expect, it } from 'vitest';
import { hermiteFunctions } from '../../../src/light/shapelets/hermiteFunctions.js';
import { ShapeletKernel } from '../../../src/light/shapelets/shapeletKernel.js';
import { shapeletOrders, shapelets, type ShapeletEngine } from '../../../src/light/shapelets/shapelets.js';
import { shapeletsOfOrder } from '../../../src/light/index.js';
import { InputError } from '../../../src/errors.js';

// Physicists' Hermite polynomials written out (Abramowitz & Stegun 1964, Table 22.12).
const hermitePolynomials = [
  (u: number) => 1,
  (u: number) => 2 * u,
  (u: number) => 4 * u ** 2 - 2,
  (u: number) => 8 * u ** 3 - 12 * u,
  (u: number) => 16 * u ** 4 - 48 * u ** 2 + 12,
  (u: number) => 32 * u ** 5 - 160 * u ** 3 + 120 * u,
  (u: number) => 64 * u ** 6 - 480 * u ** 4 + 720 * u ** 2 - 120,
];
const factorial = (k: number): number => (k <= 1 ? 1 : k * factorial(k - 1));

describe('Hermite functions', () => {
  it('match (2^k sqrt(pi) k!)^-1/2 H_k(u) exp(-u^2/2) (Refregier 2003, eq. 1) for k <= 6', () => {
    const out = new Float64Array(7);
    for (const u of [-2.3, -0.7, 0, 0.4, 1.9, 3.5]) {
      hermiteFunctions(u, 6, out);
      for (let k = 0; k <= 6; k++) {
        const expected = hermitePolynomials[k](u) * Math.exp(-0.5 * u * u)
          / Math.sqrt(2 ** k * Math.sqrt(Math.PI) * factorial(k));
        expect(Math.abs(out[k] - expected)).toBeLessThan(1e-14);
      }
    }
  });

  it('stay orthonormal up to order 120, where k! alone overflows (recurrence is stable)', () => {
    // Midpoint rule over [-24, 24] (phi_120 is negligible beyond |u| ~ 17), step 0.01.
    // The integrand phi_j phi_k is smooth and decays like a Gaussian, so the rule converges
    // faster than any power of the step; 1e-10 is far above its error.
    const maxOrder = 120;
    expect(factorial(171)).toBe(Infinity);
    const step = 0.01;
    const table: Float64Array[] = [];
    for (let u = -24 + step / 2; u < 24; u += step) {
      const row = new Float64Array(maxOrder + 1);
      hermiteFunctions(u, maxOrder, row);
      table.push(row);
    }
    for (const [j, k] of [[0, 0], [60, 60], [120, 120], [119, 120], [118, 120], [3, 117]]) {
      let sum = 0;
      for (const row of table) sum += row[j] * row[k];
      expect(Math.abs(sum * step - (j === k ? 1 : 0))).toBeLessThan(1e-10);
    }
  });
});

describe('Cartesian shapelets', () => {
  it('have (n+1)(n+2)/2 basis functions ordered by n1 + n2', () => {
    for (const maxOrder of [0, 1, 4, 6]) {
      expect(shapelets(maxOrder).basisCount).toBe(((maxOrder + 1) * (maxOrder + 2)) / 2);
    }
    expect(shapeletOrders(2)).toEqual([[0, 0], [1, 0], [0, 1], [2, 0], [1, 1], [0, 2]]);
    expect(shapelets(3).parameterNames).toEqual(['centerXArcsec', 'centerYArcsec', 'scaleArcsec']);
    expect(shapeletsOfOrder(5)).toBe(shapeletsOfOrder(5));
  });

  it('reject a maximum order that is not a whole number >= 0', () => {
    expect(() => shapelets(-1)).toThrow(InputError);
    expect(() => shapelets(2.5)).toThrow(InputError);
  });

  it('are orthonormal over the plane for maxOrder 6 (Refregier 2003, eq. 3)', () => {
    // Midpoint grid over the centre +- 14 beta (phi_6 negligible beyond ~7), step beta / 10:
    // Gaussian-times-polynomial integrands make the rule converge faster than any power.
    const profile = shapelets(6);
    const beta = 0.25;
    const centerX = 0.13;
    const centerY = -0.4;
    const step = beta / 10;
    const side = 280;
    const count = side * side;
    const x = new Float64Array(count);
    const y = new Float64Array(count);
    for (let j = 0; j < side; j++) {
      for (let i = 0; i < side; i++) {
        x[j * side + i] = centerX + (i + 0.5 - side / 2) * step;
        y[j * side + i] = centerY + (j + 0.5 - side / 2) * step;
      }
    }
    const basis = new Float64Array(profile.basisCount * count);
    profile.writeBasis(Float64Array.of(centerX, centerY, beta), 0, x, y, count, basis, 0, count);
    let worst = 0;
    for (let a = 0; a < profile.basisCount; a++) {
      for (let b = 0; b <= a; b++) {
        let sum = 0;
        for (let i = 0; i < count; i++) sum += basis[a * count + i] * basis[b * count + i];
        worst = Math.max(worst, Math.abs(sum * step * step - (a === b ? 1 : 0)));
      }
    }
    expect(worst).toBeLessThan(1e-10);
  });

  it('put n1 along x and n2 along y, scaled by beta, at a hand-computed point', () => {
    // B_(1,0)(x, y) = beta^-1 phi_1(dx / beta) phi_0(dy / beta), phi_0 = pi^-1/4 e^(-u^2/2),
    // phi_1 = sqrt(2) u phi_0; B_(0,2) uses phi_2 = (2u^2 - 1) / sqrt(2) phi_0.
    const beta = 0.5;
    const [cx, cy] = [1, -1];
    const [px, py] = [1.3, -0.8];
    const u = (px - cx) / beta;
    const v = (py - cy) / beta;
    const phi0 = (t: number) => Math.pow(Math.PI, -0.25) * Math.exp(-0.5 * t * t);
    const profile = shapelets(2);
    const out = new Float64Array(6);
    profile.writeBasis(Float64Array.of(cx, cy, beta), 0, Float64Array.of(px), Float64Array.of(py), 1, out, 0, 1);
    expect(out[0]).toBeCloseTo(phi0(u) * phi0(v) / beta, 14);
    expect(out[1]).toBeCloseTo(Math.SQRT2 * u * phi0(u) * phi0(v) / beta, 14);
    expect(out[2]).toBeCloseTo(Math.SQRT2 * v * phi0(u) * phi0(v) / beta, 14);
    expect(out[5]).toBeCloseTo(((2 * v * v - 1) / Math.SQRT2) * phi0(v) * phi0(u) / beta, 14);
  });

  it('give the same basis point by point and in blocks of many points (more than one block)', () => {
    // The block recurrence must equal hermiteFunctions point by point (same arithmetic), across
    // block boundaries; checked against a per-point evaluation of the written-out definition.
    const n = 700;
    const x = Float64Array.from({ length: n }, (_, i) => -1 + (2 * i) / n);
    const y = Float64Array.from({ length: n }, (_, i) => 0.7 * Math.sin(i));
    const p = Float64Array.of(0.1, -0.05, 0.3);
    const order = 8;
    const profile = shapelets(order);
    const count = profile.basisCount;
    const out = new Float64Array(count * n);
    profile.writeBasis(p, 0, x, y, n, out, 0, n);
    const hx = new Float64Array(order + 1), hy = new Float64Array(order + 1);
    const orders = shapeletOrders(order);
    let worst = 0;
    for (let i = 0; i < n; i++) {
      hermiteFunctions((x[i] - 0.1) / 0.3, order, hx);
      hermiteFunctions((y[i] + 0.05) / 0.3, order, hy);
      orders.forEach(([n1, n2], k) => { worst = Math.max(worst, Math.abs(out[k * n + i] - hx[n1] * hy[n2] / 0.3)); });
    }
    expect(worst).toBeLessThan(1e-15);
  });

  it('have a fast twin (table-driven exp) within 1e-10 of the reference, relative to the basis peak', () => {
    // fastExp errs below 3.9e-11 relative (src/numeric/elementary/fastExp.ts); the recurrence
    // carries that factor unchanged to every order.
    const pair = shapeletsOfOrder(10);
    const n = 300;
    const x = Float64Array.from({ length: n }, (_, i) => -2 + (4 * i) / n);
    const y = Float64Array.from({ length: n }, (_, i) => Math.cos(0.3 * i));
    const p = Float64Array.of(0, 0, 0.5);
    const a = new Float64Array(66 * n), b = new Float64Array(66 * n);
    pair.reference.writeBasis(p, 0, x, y, n, a, 0, n);
    pair.fast.writeBasis(p, 0, x, y, n, b, 0, n);
    const peak = a.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
    let worst = 0;
    for (let k = 0; k < a.length; k++) worst = Math.max(worst, Math.abs(a[k] - b[k]));
    expect(worst / peak).toBeLessThan(1e-10);
    expect(worst).toBeGreaterThan(0);
  });

  it('average runs of positions exactly as writeBasis followed by in-order sums (the LightProfile contract)', () => {
    // Orders even and odd, below and above four: the run means walk the triangle of (n1, n2)
    // in blocks of two n1 by four n2 rows, with narrower passes at its edges.
    // Both engines: the WebAssembly kernel (vectors across bases, each sum in point order) and
    // its JavaScript twin.
    for (const engine of ['auto', 'javaScript'] as const) {
      for (const order of [0, 1, 2, 5, 7, 10, 11]) expectRunMeansMatchBasis(order, engine);
    }
  });

  it('run the WebAssembly kernel on this engine, with the JavaScript twin\'s bits for every point count', () => {
    // Node 20 has WebAssembly SIMD (from memory: V8 has shipped it since about version 9.1, Node 16.4; the assertion below checks it here), so 'auto' is the
    // kernel here and the comparisons above and below are between two implementations.
    expect(ShapeletKernel.create(10)).not.toBeNull();
    const p = Float64Array.of(-0.03, 0.04, 0.15);
    for (const order of [0, 1, 4, 10, 13]) {
      // Odd and even counts, one and several blocks (the recurrence goes two points at a time).
      for (const n of [1, 7, 256, 601]) {
        const x = Float64Array.from({ length: n }, (_, i) => 0.5 * Math.sin(0.7 * i + order));
        const y = Float64Array.from({ length: n }, (_, i) => 0.4 * Math.cos(0.23 * i));
        const [a, b] = (['auto', 'javaScript'] as const).map((engine) => {
          const profile = shapelets(order, undefined, engine);
          const out = new Float64Array(profile.basisCount * n);
          profile.writeBasis(p, 0, x, y, n, out, 0, n);
          return out;
        });
        expect(a).toEqual(b);
      }
    }
  });
});

/** writeRunMeans of shapelets(order) against writeBasis summed in order, bit for bit. */
function expectRunMeansMatchBasis(order: number, engine: ShapeletEngine): void {
  const profile = shapelets(order, undefined, engine);
  const count = profile.basisCount;
  const p = Float64Array.of(0.05, 0.02, 0.2);
  for (const run of [1, 4, 9, 16, 25, 64, 1024]) {
    const runs = 9;
    const n = runs * run;
    const x = Float64Array.from({ length: n }, (_, i) => 0.4 * Math.sin(0.37 * i));
    const y = Float64Array.from({ length: n }, (_, i) => 0.3 * Math.cos(0.11 * i));
    const all = new Float64Array(count * n);
    profile.writeBasis(p, 0, x, y, n, all, 0, n);
    const target = Int32Array.from({ length: runs }, (_, t) => (5 * t) % runs);
    const means = new Float64Array(count * runs);
    profile.writeRunMeans!(p, 0, x, y, runs, run, target, means, 0, runs);
    for (let k = 0; k < count; k++) {
      for (let t = 0; t < runs; t++) {
        let sum = 0;
        for (let i = t * run; i < (t + 1) * run; i++) sum += all[k * n + i];
        expect(means[k * runs + target[t]]).toBe(sum * (1 / run));
      }
    }
  }
}
