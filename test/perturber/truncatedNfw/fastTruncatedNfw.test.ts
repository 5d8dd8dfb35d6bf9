// The fast truncated NFW (src/perturber/truncatedNfw/fastTruncatedNfw.ts) against its reference formula beside it.
import { describe, expect, it } from 'vitest';
import { fastTruncatedNfw } from '../../../src/perturber/truncatedNfw/fastTruncatedNfw.js';
import { truncatedNfw } from '../../../src/perturber/truncatedNfw/truncatedNfw.js';
import { uniformSequence } from '../../support/uniformSequence.js';

describe('fast truncated NFW', () => {
  it('fastTruncatedNfw deflects as the truncated NFW of src/perturber to 1e-12 relative, by table and directly', () => {
    // Reference: truncatedNfw.ts (Math.log, Math.atan); bound stated in fastTruncatedNfw.ts and
    // truncatedNfwDeflectionTable.ts. Radii over x = 1e-4..300 scale radii (inside the table's
    // 1/128..256 and outside), both sides of x = 1/2 and of the series near x = 1; truncation
    // ratios of the demo (3), a tight (0.5) and a wide (15) halo. 20000 points use the table;
    // the same points in calls of 500 (fewer than TABLE_MINIMUM_POINTS, a new ratio each time)
    // use the direct formulas.
    const next = uniformSequence(17);
    const n = 20000;
    const x = new Float64Array(n), y = new Float64Array(n);
    let worstTable = 0;
    let worstDirect = 0;
    for (const tau of [0.5, 3, 15]) {
      const thetaS = 0.2;
      for (let k = 0; k < n; k++) {
        const radius = thetaS * Math.exp(Math.log(1e-4) + (Math.log(300) - Math.log(1e-4)) * next());
        const angle = 2 * Math.PI * next();
        x[k] = 0.78 + radius * Math.cos(angle);
        y[k] = 0.98 + radius * Math.sin(angle);
      }
      const ax = new Float64Array(n), ay = new Float64Array(n), bx = new Float64Array(n), by = new Float64Array(n);
      const p = Float64Array.of(0.4, thetaS, tau, 0.78, 0.98);
      truncatedNfw.addDeflection(p, 0, x, y, n, ax, ay);
      fastTruncatedNfw.addDeflection(p, 0, x, y, n, bx, by);
      for (let k = 0; k < n; k++) {
        worstTable = Math.max(worstTable, Math.hypot(ax[k] - bx[k], ay[k] - by[k]) / Math.hypot(ax[k], ay[k]));
      }
      const m = 500;
      // A ratio the table does not hold, so that the small calls take the direct path.
      const q = Float64Array.of(0.4, thetaS, tau * (1 + 1e-8), 0.78, 0.98);
      for (let start = 0; start < n; start += m) {
        const cx = new Float64Array(m), cy = new Float64Array(m), dx = new Float64Array(m), dy = new Float64Array(m);
        const px = x.slice(start, start + m), py = y.slice(start, start + m);
        truncatedNfw.addDeflection(q, 0, px, py, m, cx, cy);
        fastTruncatedNfw.addDeflection(q, 0, px, py, m, dx, dy);
        for (let k = 0; k < m; k++) {
          worstDirect = Math.max(worstDirect, Math.hypot(cx[k] - dx[k], cy[k] - dy[k]) / Math.hypot(cx[k], cy[k]));
        }
      }
    }
    expect(worstTable).toBeLessThan(1e-12);
    expect(worstDirect).toBeLessThan(1e-12);
  });
});
