import { describe, expect, it } from 'vitest';
import { mainLensProfiles } from '../../src/lens/index.js';

describe('decomposed-lens profiles keep the MassProfile contract', () => {
  it('read their parameters at the offset and add into their outputs', () => {
    // src/lens/massProfile.ts: parameters sit after unrelated entries; outputs start non-zero;
    // two calls must give start + 2 * once, to rounding (common practice for superposed components).
    // 300 points (the fast twins tabulate from 256 on), one at the centre, one far outside.
    const n = 300, x = new Float64Array(n), y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      x[i] = 0.02 + 2.5 * Math.cos(0.37 * i) * (i / n);
      y[i] = -0.01 + 2.5 * Math.sin(0.37 * i) * (i / n);
    }
    x[n - 1] = 900;
    const values: Record<string, number> = {
      convergenceAtEffectiveRadius: 0.4, effectiveRadiusArcsec: 0.9, sersicIndex: 3.5, axisRatio: 0.7,
      positionAngleDeg: 25, centerXArcsec: 0.02, centerYArcsec: -0.01, massToLightGradient: -0.1,
      convergenceScale: 0.2, scaleRadiusArcsec: 6, innerSlope: 1.3,
    };
    for (const kind of ['stellarSersic', 'nfwHalo', 'generalisedNfwHalo'] as const) {
      for (const profile of [mainLensProfiles[kind].reference, mainLensProfiles[kind].fast]) {
        const p = Float64Array.from([99, -99, ...profile.parameterNames.map((name) => values[name])]);
        const once = [new Float64Array(n), new Float64Array(n)], kappaOnce = new Float64Array(n);
        // A fast Sersic twin tabulates an index from its second sighting on: let it settle first.
        profile.addDeflection(p, 2, x, y, n, new Float64Array(n), new Float64Array(n));
        profile.addDeflection(p, 2, x, y, n, once[0], once[1]);
        profile.addConvergence(p, 2, x, y, n, kappaOnce);
        const start = (shift: number): Float64Array => Float64Array.from({ length: n }, (_, i) => shift + i);
        const twice = [start(1), start(5)], kappaTwice = start(1);
        for (let k = 0; k < 2; k++) {
          profile.addDeflection(p, 2, x, y, n, twice[0], twice[1]);
          profile.addConvergence(p, 2, x, y, n, kappaTwice);
        }
        for (let i = 0; i < n; i++) {
          expect(twice[0][i]).toBeCloseTo(1 + i + 2 * once[0][i], 11);
          expect(twice[1][i]).toBeCloseTo(5 + i + 2 * once[1][i], 11);
          expect(kappaTwice[i]).toBeCloseTo(1 + i + 2 * kappaOnce[i], 11);
          expect(Number.isFinite(once[0][i]) && Number.isFinite(kappaOnce[i])).toBe(true);
        }
        expect(profile.sphericalMassWithin!(p, 2, 1.5)).toBeGreaterThan(0);
      }
    }
  });
});
