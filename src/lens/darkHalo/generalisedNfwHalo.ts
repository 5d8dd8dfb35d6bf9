import type { MassProfile } from '../massProfile.js';
import { ellipticalHalo } from './ellipticalHalo.js';
import { generalisedNfwConvergenceShape } from './generalisedNfwProjection.js';

/**
 * Elliptical generalised NFW halo: the projection of rho = rho_s / ((r/r_s)^gamma (1 + r/r_s)^(3 - gamma))
 * (Zhao 1996; generalisedNfwProjection.ts) read on the circularised radius as for nfwHalo.
 * Parameters: convergenceScale, scaleRadiusArcsec, axisRatio, positionAngleDeg, centerXArcsec,
 * centerYArcsec, innerSlope (gamma, 0 <= gamma < 2; 1 is the NFW). Each new inner slope fits a new
 * Gaussian expansion (a few milliseconds; the last eight are kept).
 */
export const generalisedNfwHalo: MassProfile = ellipticalHalo(
  'generalisedNfwHalo',
  ['convergenceScale', 'scaleRadiusArcsec', 'axisRatio', 'positionAngleDeg', 'centerXArcsec', 'centerYArcsec', 'innerSlope'],
  generalisedNfwConvergenceShape,
  undefined,
);
