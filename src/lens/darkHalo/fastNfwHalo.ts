import { tabulatedTwin } from '../deflectionTable/tabulatedTwin.js';
import type { MassProfile } from '../massProfile.js';
import { HALO_EXPANSION_RANGE } from './ellipticalHalo.js';
import { nfwHalo } from './nfwHalo.js';

/**
 * The elliptical NFW of nfwHalo.ts, same parameters, its deflection interpolated in a table
 * of the reference's own values (deflectionTable/), over the radii of the Gaussian expansion.
 * Tested against the reference in test/lens/darkHalo/fastHalo.test.ts.
 */
export const fastNfwHalo: MassProfile = tabulatedTwin(nfwHalo, {
  radiusRange: () => [HALO_EXPANSION_RANGE.minRadius, HALO_EXPANSION_RANGE.maxRadius],
});
