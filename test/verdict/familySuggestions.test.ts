// Tests of src/verdict/familySuggestions.ts and familyComponents.ts: which smooth-model freedom no
// family tried (arcsift's own list, after the systematics the trade reports: multipoles, power law
// against stars plus dark matter, the source model).
import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadVerdictConfig } from '../../src/config/verdictConfig.js';
import { familyComponents, type FamilyComponents } from '../../src/verdict/familyComponents.js';
import { familySuggestions } from '../../src/verdict/familySuggestions.js';

const fixture = fileURLToPath(new URL('../fixtures/verdict/multipole-lens.yaml', import.meta.url));
const components = (partial: Partial<FamilyComponents>): FamilyComponents => ({
  massKinds: ['isothermalEllipsoid'], shear: false, multipoleOrders: [], sourceKinds: ['sersic'], lens: '', source: '', ...partial,
});

describe('families not tried', () => {
  it('describes each family\'s components', () => {
    const [plain, multipoles] = loadVerdictConfig(fixture).families.map((f) => familyComponents(f.config));
    expect(plain).toEqual({ massKinds: ['isothermalEllipsoid'], shear: false, multipoleOrders: [], sourceKinds: ['sersic'], lens: 'isothermalEllipsoid', source: 'sersic' });
    expect(multipoles.lens).toBe('isothermalEllipsoid + multipoles m = 3, 4');
  });

  it('names each kind of freedom no family has, and only those', () => {
    const none = familySuggestions([components({})]);
    expect(none).toHaveLength(5);
    expect(none[0]).toMatch(/^the lens with m = 1, 3 and 4 multipoles/);
    expect(familySuggestions([components({ multipoleOrders: [3, 4] })])[0]).toBe('multipoles of order 1 (lens.multipoles), which no family has');
    const all = familySuggestions([
      components({ shear: true, multipoleOrders: [1, 3, 4] }),
      components({ massKinds: ['powerLawEllipsoid'], sourceKinds: ['pixelated'] }),
      components({ massKinds: ['stellarSersic', 'generalisedNfwHalo'] }),
    ]);
    expect(all).toEqual([expect.stringMatching(/^every kind of smooth freedom arcsift offers was tried: look at the data/)]);
    // Stars without a halo are not a decomposed lens.
    expect(familySuggestions([components({ massKinds: ['stellarSersic'] })]).some((s) => s.startsWith('a decomposed lens'))).toBe(true);
    // A shapelets family leaves only the pixelated source to suggest.
    expect(familySuggestions([components({ sourceKinds: ['shapelets'] })]).find((s) => s.startsWith('a pixelated source'))).toBe('a pixelated source (source.light kind: pixelated)');
  });
});
