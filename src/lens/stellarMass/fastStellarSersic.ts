import { tabulatedTwin } from '../deflectionTable/tabulatedTwin.js';
import type { MassProfile } from '../massProfile.js';
import { stellarSersic, sersicExpansionOuterRadius } from './stellarSersic.js';

/**
 * The Sersic stellar mass of stellarSersic.ts, same parameters, its deflection interpolated
 * in a table of the reference's own values (deflectionTable/): one table per Sersic index (built
 * once the same index comes twice in a row, so a fit that samples the index runs the reference),
 * the mass-to-light gradient along its shape axis (nodes -0.9, -0.8, ..., 0.9), radii from 1e-4
 * R_e to where the expansion ends. Tested against the reference in
 * test/lens/stellarMass/fastStellarSersic.test.ts.
 */
export const fastStellarSersic: MassProfile = tabulatedTwin(stellarSersic, {
  keyIndex: 2,
  shape: { index: 7, axis: { first: -0.9, step: 0.1, count: 19 } },
  radiusRange: (sersicIndex) => [1e-4, sersicExpansionOuterRadius(sersicIndex)],
});
