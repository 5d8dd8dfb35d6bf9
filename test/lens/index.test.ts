import { describe, expect, it } from 'vitest';
import * as lens from '../../src/lens/index.js';

describe('lens index', () => {
  it('maps each config kind name to the profile of that kind', () => {
    // The table's contract (src/lens/index.ts): key === kind of both the reference and the fast
    // evaluation, which read the same parameters; six main-lens kinds.
    expect(Object.keys(lens.mainLensProfiles).sort()).toEqual([
      'externalShear', 'generalisedNfwHalo', 'isothermalEllipsoid', 'nfwHalo', 'powerLawEllipsoid', 'stellarSersic',
    ]);
    for (const [name, pair] of Object.entries(lens.mainLensProfiles)) {
      expect(pair.reference.kind).toBe(name);
      expect(pair.fast.kind).toBe(name);
      expect(pair.fast.parameterNames).toEqual(pair.reference.parameterNames);
    }
    expect(lens.mainLensProfiles.isothermalEllipsoid.reference).toBe(lens.isothermalEllipsoid);
    expect(lens.mainLensProfiles.isothermalEllipsoid.fast).toBe(lens.fastIsothermalEllipsoid);
    expect(lens.mainLensProfiles.powerLawEllipsoid.fast).toBe(lens.powerLawEllipsoid);
    expect(lens.mainLensProfiles.stellarSersic.fast).toBe(lens.fastStellarSersic);
    expect(lens.mainLensProfiles.nfwHalo.fast).toBe(lens.fastNfwHalo);
    expect(lens.mainLensProfiles.generalisedNfwHalo.fast).toBe(lens.fastGeneralisedNfwHalo);
    expect(lens.multipoleOrders).toEqual([1, 3, 4]);
  });
});
