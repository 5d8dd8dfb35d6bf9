import { tabulatedTwin } from '../deflectionTable/tabulatedTwin.js';
import type { MassProfile } from '../massProfile.js';
import { HALO_EXPANSION_RANGE } from './ellipticalHalo.js';
import { generalisedNfwHalo } from './generalisedNfwHalo.js';

/**
 * The elliptical generalised NFW of generalisedNfwHalo.ts, same parameters, its deflection
 * interpolated in a table of the reference's own values (deflectionTable/) with the inner slope
 * as the table's shape axis: nodes 0, 0.1, ..., 2 (the profile takes slopes below 2). Tested
 * against the reference in test/lens/darkHalo/fastHalo.test.ts.
 */
export const fastGeneralisedNfwHalo: MassProfile = tabulatedTwin(generalisedNfwHalo, {
  shape: { index: 6, axis: { first: 0, step: 0.1, count: 21 } },
  radiusRange: () => [HALO_EXPANSION_RANGE.minRadius, HALO_EXPANSION_RANGE.maxRadius],
});
