// The fast Sersic light (src/light/sersic/fastSersic.ts) against its reference formula beside it.
import { describe, expect, it } from 'vitest';
import { fastSersic } from '../../../src/light/sersic/fastSersic.js';
import { sersic } from '../../../src/light/sersic/sersic.js';
import { uniformSequence } from '../../support/uniformSequence.js';

describe('fast Sersic light', () => {
  it('fastSersic agrees with the Sersic profile of src/light to 3.3e-10 relative where I > 1e-12 of its peak (n >= 1/2)', () => {
    // Reference: sersic.ts (Math.exp, Math.log). The bound stated in fastSersic.ts for
    // 1/2 <= n <= 8 is 27.7 T(h) + 4e-11 < 3.3e-10, met near I = 1e-12 of the peak.
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
    expect(worst).toBeLessThan(3.3e-10);
  });
});
