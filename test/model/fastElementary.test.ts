import { describe, expect, it } from 'vitest';
import { fastExp } from '../../src/model/fastExp.js';
import { fastSersic } from '../../src/model/fastSersic.js';
import { sersic } from '../../src/light/sersic.js';

/** A reproducible uniform generator (Park & Miller 1988 minimal standard), for sample points. */
function uniformSequence(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state * 16807) % 2147483647;
    return state / 2147483647;
  };
}

describe('fast elementary functions', () => {
  it('fastExp agrees with Math.exp to 1e-15 relative on [-708, 709], and is Math.exp outside', () => {
    // Reference: Math.exp (correctly rounded or within 1 ulp in V8's fdlibm port). The bound of
    // fastExp.ts is truncation 3.6e-17 plus a few roundings of 1.1e-16; 1e-15 allows 9 ulp.
    const next = uniformSequence(7);
    let worst = 0;
    for (let k = 0; k < 200000; k++) {
      const x = -708 + 1417 * next();
      worst = Math.max(worst, Math.abs(fastExp(x) - Math.exp(x)) / Math.exp(x));
    }
    for (let k = 0; k < 20000; k++) {
      const x = (next() - 0.5) * 1e-6;
      worst = Math.max(worst, Math.abs(fastExp(x) - Math.exp(x)) / Math.exp(x));
    }
    expect(worst).toBeLessThan(1e-15);
    expect(fastExp(0)).toBe(1);
    expect(fastExp(-741)).toBe(Math.exp(-741));
    expect(fastExp(Number.NEGATIVE_INFINITY)).toBe(0);
    expect(fastExp(Number.NaN)).toBeNaN();
    expect(fastExp(710)).toBe(Math.exp(710));
  });

  it('fastSersic agrees with the Sersic profile of src/light to 1e-13 relative where I > 1e-12 of its peak', () => {
    // Reference: sersic.ts (Math.exp, Math.log). The bound stated in fastSersic.ts.
    const next = uniformSequence(11);
    const n = 5000;
    const x = new Float64Array(n), y = new Float64Array(n);
    const a = new Float64Array(n), b = new Float64Array(n);
    let worst = 0;
    for (const [radius, index, q, angle] of [[0.16, 1.3, 0.7, 115], [0.05, 4, 0.4, 10], [0.9, 0.5, 1, 0], [0.3, 8, 0.9, 75]]) {
      for (let k = 0; k < n; k++) {
        x[k] = (next() - 0.5) * 12 * radius;
        y[k] = (next() - 0.5) * 12 * radius;
      }
      x[0] = 0.02; y[0] = -0.01; // the centre itself: R = 0
      const p = Float64Array.from([radius, index, q, angle, 0.02, -0.01]);
      sersic.writeBasis(p, 0, x, y, n, a, 0, n);
      fastSersic.writeBasis(p, 0, x, y, n, b, 0, n);
      const peak = a[0];
      for (let k = 0; k < n; k++) if (a[k] > 1e-12 * peak) worst = Math.max(worst, Math.abs(a[k] - b[k]) / a[k]);
    }
    expect(worst).toBeLessThan(1e-13);
  });
});
