// The example verdict config of the README (configs/verdict-demo.yaml) reads and every family
// builds, smooth and perturbed, before any run (own contract: a config in configs/ always works).
import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadVerdictConfig } from '../../src/config/verdictConfig.js';
import { checkFamilies } from '../../src/verdict/compareFamilies.js';
import { familyComponents } from '../../src/verdict/familyComponents.js';
import { familySuggestions } from '../../src/verdict/familySuggestions.js';

const example = fileURLToPath(new URL('../../configs/verdict-demo.yaml', import.meta.url));

describe('configs/verdict-demo.yaml', () => {
  it('lists four families that build, leaving only the pixelated source untried', () => {
    const { base, families } = loadVerdictConfig(example);
    expect(base.perturbers.map((p) => p.kind)).toEqual(['tidallyTruncatedNfw']);
    expect(families.map((f) => familyComponents(f.config).lens)).toEqual([
      'isothermalEllipsoid + external shear',
      'isothermalEllipsoid + external shear + multipoles m = 1, 3, 4',
      'powerLawEllipsoid + external shear + multipoles m = 1, 3, 4',
      'stellarSersic + nfwHalo + external shear + multipoles m = 1, 3, 4',
    ]);
    const settings = { livePoints: 50, seed: 1, method: 'auto' as const, replacementsPerStep: 2, lnZTolerance: 0.1, threads: 1 };
    expect(checkFamilies(families, { evidence: () => settings })).toEqual(['slice', 'slice', 'slice', 'slice']);
    expect(familySuggestions(families.map((f) => familyComponents(f.config)))).toEqual([
      'a pixelated source (source.light kind: pixelated), or a shapelets source of a few orders',
    ]);
  });
});
