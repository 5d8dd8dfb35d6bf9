import type { MassProfile } from '../massProfile.js';
import { ellipticalHalo } from './ellipticalHalo.js';
import { nfwConvergenceShape } from './nfwProjection.js';

/**
 * Elliptical NFW halo (Navarro, Frenk & White 1996): the projected NFW convergence
 * kappa = 2 kappa_s (1 - F(X)) / (X^2 - 1) (Bartelmann 1996, A&A 313, 697) read on the
 * circularised radius, X = xi / theta_s, xi^2 = q x'^2 + y'^2 / q, so an ellipse of area pi R^2
 * holds the mass the round halo holds within R. Parameters: convergenceScale, scaleRadiusArcsec,
 * axisRatio, positionAngleDeg, centerXArcsec, centerYArcsec. Deflection through the Gaussian
 * expansion of the convergence (ellipticalHalo.ts).
 */
export const nfwHalo: MassProfile = ellipticalHalo(
  'nfwHalo',
  ['convergenceScale', 'scaleRadiusArcsec', 'axisRatio', 'positionAngleDeg', 'centerXArcsec', 'centerYArcsec'],
  (bigX) => 2 * nfwConvergenceShape(bigX),
  1,
);
