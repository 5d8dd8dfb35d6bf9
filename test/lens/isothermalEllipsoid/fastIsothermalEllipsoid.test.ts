// The fast isothermal ellipsoid (src/lens/isothermalEllipsoid/fastIsothermalEllipsoid.ts) against its reference formula beside it.
import { describe, expect, it } from 'vitest';
import { fastIsothermalEllipsoid } from '../../../src/lens/isothermalEllipsoid/fastIsothermalEllipsoid.js';
import { isothermalEllipsoid } from '../../../src/lens/isothermalEllipsoid/isothermalEllipsoid.js';
import { uniformSequence } from '../../support/uniformSequence.js';

describe('fast isothermal ellipsoid', () => {
  it('fastIsothermalEllipsoid deflects as the isothermal ellipsoid of src/lens to 1e-12 arcsec', () => {
    // Reference: isothermalEllipsoid.ts (Math.atan, Math.atanh); bound stated in
    // fastIsothermalEllipsoid.ts. Cases: the demo lens, a flat one with a core, a nearly round
    // one (series branch) and one just outside the series branch (e^2 = 2e-6).
    const next = uniformSequence(3);
    const n = 20000;
    const x = new Float64Array(n), y = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      x[k] = (next() - 0.5) * 6;
      y[k] = (next() - 0.5) * 6;
    }
    let worst = 0;
    for (const parameters of [
      [1.18, 0.82, 32, 0.02, -0.015, 0], [0.8, 0.3, 100, -0.1, 0.2, 0.05], [1.5, 1 - 1e-8, 0, 0, 0, 0], [1, Math.sqrt(1 - 2e-6), 45, 0, 0, 0],
    ]) {
      const p = Float64Array.from(parameters);
      const ax = new Float64Array(n), ay = new Float64Array(n), bx = new Float64Array(n), by = new Float64Array(n);
      isothermalEllipsoid.addDeflection(p, 0, x, y, n, ax, ay);
      fastIsothermalEllipsoid.addDeflection(p, 0, x, y, n, bx, by);
      for (let k = 0; k < n; k++) worst = Math.max(worst, Math.abs(ax[k] - bx[k]), Math.abs(ay[k] - by[k]));
    }
    expect(worst).toBeLessThan(1e-12);
  });
});
