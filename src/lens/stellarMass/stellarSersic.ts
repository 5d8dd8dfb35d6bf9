import { fitGaussianExpansion } from '../../numeric/approximation/gaussianExpansion.js';
import { ExpansionCache } from '../gaussianSum/expansionCache.js';
import { EllipticalGaussianSum } from '../gaussianSum/ellipticalGaussianSum.js';
import { gaussianSumProfile } from '../gaussianSum/gaussianSumProfile.js';
import type { MassProfile } from '../massProfile.js';
import { sersicMassShape, sersicRoot } from './sersicMassShape.js';
import { sersicSphericalMass } from './sersicSphericalMass.js';

/**
 * The Gaussian expansion of the stellar mass (sersicMassShape.ts) covers X = R / R_e from 1e-5 to
 * where exp(-b_n (X^(1/n) - 1)) falls to 1e-5 (about 8, 17, 39 and 82 R_e at n = 1, 2, 4, 8), with
 * residuals relative to the density plus 1e-5 of its value at R_e: the mass beyond holds no
 * deflection inside (Schramm 1990's homoeoid theorem) and a model image never reaches it. With 8
 * widths per decade (54 to 63 Gaussians) the convergence is within 3e-5 of the law from 0.01 R_e to
 * two thirds of that radius (up to 10 R_e) for 0.6 <= n <= 6 and |eta| <= 0.3, the deflection
 * within 3e-6 (2.4e-5 at 0.01 R_e for n = 6, eta = -0.3, whose centre is steepest;
 * test/lens/stellarMass/stellarSersic.test.ts).
 */
export const SERSIC_EXPANSION = Object.freeze({ minRadius: 1e-5, widthsPerDecade: 8, floor: 1e-5, tailLevel: 1e-5 });

/** Where the expansion ends, in R_e: exp(-b_n (X^(1/n) - 1)) = SERSIC_EXPANSION.tailLevel. */
export function sersicExpansionOuterRadius(sersicIndex: number): number {
  return Math.pow(1 - Math.log(SERSIC_EXPANSION.tailLevel) / sersicRoot(sersicIndex), sersicIndex);
}

const cache = new ExpansionCache((sersicIndex, gradient) => fitGaussianExpansion(
  (bigX) => sersicMassShape(bigX, sersicIndex, gradient),
  {
    minRadius: SERSIC_EXPANSION.minRadius,
    maxRadius: sersicExpansionOuterRadius(sersicIndex),
    widthsPerDecade: SERSIC_EXPANSION.widthsPerDecade,
    floor: SERSIC_EXPANSION.floor,
  },
));
const sum = new EllipticalGaussianSum();

function place(p: Float64Array, offset: number): EllipticalGaussianSum {
  sum.setScaled(cache.get(p[offset + 2], p[offset + 7]), p[offset], p[offset + 1]);
  return sum;
}

/**
 * Stellar mass that follows a Sersic light profile, with an optional power-law gradient of the
 * mass-to-light ratio: in the frame x' along the major axis,
 *   kappa = kappa_e exp(-b_n ((xi / R_e)^(1/n) - 1)) (xi / R_e)^eta,   xi^2 = q x'^2 + y'^2 / q,
 * parameters convergenceAtEffectiveRadius (kappa_e), effectiveRadiusArcsec (R_e, circularised as for
 * the Sersic light), sersicIndex (n, 0.5 to 10), axisRatio, positionAngleDeg, centerXArcsec,
 * centerYArcsec, massToLightGradient (eta, |eta| < 1). The total mass is
 * kappa_e Sigma_crit R_e^2 sersicMassShapeTotal(n, eta). Convergence and deflection are those of
 * the profile's Gaussian expansion (Shajib 2019, MNRAS 488, 1387); the spherical mass is that of
 * the Sersic law deprojected (sersicSphericalMass.ts; the expansion's amplitudes alternate in sign
 * and their deprojection amplifies the fit's residuals).
 */
export const stellarSersic: MassProfile = gaussianSumProfile(
  'stellarSersic',
  [
    'convergenceAtEffectiveRadius', 'effectiveRadiusArcsec', 'sersicIndex', 'axisRatio', 'positionAngleDeg',
    'centerXArcsec', 'centerYArcsec', 'massToLightGradient',
  ],
  place,
  // Abel deprojection of the Sersic law itself (sersicSphericalMass.ts): kappa_e R_e^2 M(<r / R_e).
  (p, offset, radiusArcsec) => {
    const effectiveRadius = p[offset + 1];
    return p[offset] * effectiveRadius * effectiveRadius * sersicSphericalMass(radiusArcsec / effectiveRadius, p[offset + 2], p[offset + 7]);
  },
);
