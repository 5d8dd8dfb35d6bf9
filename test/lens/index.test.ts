import { describe, expect, it } from 'vitest';
import * as lens from '../../src/lens/index.js';

describe('lens index', () => {
  it('maps each config kind name to the profile of that kind', () => {
    // The table's contract (src/lens/index.ts): key === profile.kind, three main-lens kinds.
    expect(Object.keys(lens.mainLensProfiles).sort()).toEqual(['externalShear', 'isothermalEllipsoid', 'powerLawEllipsoid']);
    for (const [name, profile] of Object.entries(lens.mainLensProfiles)) expect(profile.kind).toBe(name);
    expect(lens.mainLensProfiles.isothermalEllipsoid).toBe(lens.isothermalEllipsoid);
    expect(lens.multipoleOrders).toEqual([1, 3, 4]);
  });
});
