import { describe, expect, it } from 'vitest';
import { perturberProfiles } from '../../src/perturber/index.js';

describe('perturberProfiles table', () => {
  it('maps each kind name to the profile of that kind', () => {
    expect(Object.keys(perturberProfiles).sort()).toEqual(['nfw', 'pointMass', 'pseudoJaffe', 'truncatedNfw']);
    for (const [kind, pair] of Object.entries(perturberProfiles)) {
      expect(pair.reference.kind).toBe(kind);
      expect(pair.fast.kind).toBe(kind);
      expect(pair.fast.parameterNames).toEqual(pair.reference.parameterNames);
    }
  });

  it('every method adds into its outputs and reads parameters at the offset (MassProfile contract)', () => {
    // Parameters sit after two unrelated entries; the outputs start non-zero. Adding twice must
    // give start + 2 * once, and the start must survive (src/lens/massProfile.ts).
    const x = Float64Array.of(0.3, -0.7, 1.9), y = Float64Array.of(0.1, 0.45, -1.2);
    const values: Record<string, number> = {
      convergenceScale: 0.2, scaleRadiusArcsec: 0.5, truncationRatio: 4, strengthArcsec: 0.1,
      coreRadiusArcsec: 0.01, truncationRadiusArcsec: 0.6, einsteinRadiusArcsec: 0.05,
      centerXArcsec: 0.05, centerYArcsec: -0.02,
    };
    for (const profile of Object.values(perturberProfiles).flatMap((pair) => [pair.reference, pair.fast])) {
      const p = Float64Array.from([99, -99, ...profile.parameterNames.map((name) => values[name])]);
      const once = [new Float64Array(3), new Float64Array(3)];
      profile.addDeflection(p, 2, x, y, 3, once[0], once[1]);
      const twice = [Float64Array.of(1, 2, 3), Float64Array.of(4, 5, 6)];
      profile.addDeflection(p, 2, x, y, 3, twice[0], twice[1]);
      profile.addDeflection(p, 2, x, y, 3, twice[0], twice[1]);
      for (let i = 0; i < 3; i++) {
        expect(once[0][i]).not.toBe(0);
        expect(twice[0][i]).toBeCloseTo(1 + i + 2 * once[0][i], 14);
        expect(twice[1][i]).toBeCloseTo(4 + i + 2 * once[1][i], 14);
      }
      const kappa = Float64Array.of(7, 7, 7);
      profile.addConvergence(p, 2, x, y, 3, kappa);
      for (let i = 0; i < 3; i++) expect(kappa[i] >= 7).toBe(true);
      expect(profile.parameterNames.every((name) => name in values)).toBe(true);
    }
  });
});
