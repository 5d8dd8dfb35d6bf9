import { fitGaussianExpansion, type GaussianExpansion } from '../../numeric/approximation/gaussianExpansion.js';
import { ExpansionCache } from '../gaussianSum/expansionCache.js';
import { EllipticalGaussianSum } from '../gaussianSum/ellipticalGaussianSum.js';
import { gaussianSumProfile } from '../gaussianSum/gaussianSumProfile.js';
import type { MassProfile } from '../massProfile.js';
import { generalisedNfwEnclosedMassFactor } from './generalisedNfwEnclosedMass.js';

/**
 * Radii (in scale radii) over which a halo's convergence is expanded in Gaussians, and their
 * density. Outside, the sum departs from the profile: inside 1e-4 r_s it stays finite, beyond
 * 100 r_s it falls off. The outer cut changes no deflection inside it (the mass outside a
 * homoeoid deflects nothing inside it, Schramm 1990, A&A 231, 19); the inner one lowers the mass
 * within the first few 1e-4 r_s. 6 widths per decade give 42 Gaussians, a convergence within 1e-4
 * of the profile and a deflection within 2e-6 from 0.01 r_s out (1e-4 from 1e-3 r_s;
 * test/lens/darkHalo/ellipticalHalo.test.ts).
 */
export const HALO_EXPANSION_RANGE = Object.freeze({ minRadius: 1e-4, maxRadius: 100, widthsPerDecade: 6 });

/** The Gaussian expansion of G(X) = kappa / kappa_s of a halo of the given inner slope. */
export function haloExpansion(convergenceShape: (bigX: number) => number): GaussianExpansion {
  return fitGaussianExpansion(convergenceShape, HALO_EXPANSION_RANGE);
}

/**
 * An elliptical halo: kappa(xi) = kappa_s G(xi / theta_s; gamma), xi^2 = q x'^2 + y'^2 / q (x'
 * along the major axis), parameters in the order convergenceScale (kappa_s = rho_s r_s /
 * Sigma_crit), scaleRadiusArcsec, axisRatio, positionAngleDeg, centerXArcsec, centerYArcsec, then
 * the inner slope when `fixedInnerSlope` is undefined. Convergence and deflection are those of G's
 * Gaussian expansion (ellipticalGaussianSum.ts); the spherical mass is the closed form of the
 * three-dimensional profile (generalisedNfwEnclosedMass.ts).
 */
export function ellipticalHalo(
  kind: string, parameterNames: readonly string[], convergenceShape: (bigX: number, innerSlope: number) => number,
  fixedInnerSlope: number | undefined,
): MassProfile {
  const cache = new ExpansionCache((innerSlope) => haloExpansion((bigX) => convergenceShape(bigX, innerSlope)));
  const sum = new EllipticalGaussianSum();
  const slopeOf = (p: Float64Array, offset: number): number => fixedInnerSlope ?? p[offset + 6];
  const place = (p: Float64Array, offset: number): EllipticalGaussianSum => {
    sum.setScaled(cache.get(slopeOf(p, offset)), p[offset], p[offset + 1]);
    return sum;
  };
  // M(<r) = 4 pi rho_s r_s^3 m(r / r_s) = 4 pi kappa_s theta_s^2 m (Sigma_crit arcsec^2), Zhao 1996.
  const sphericalMassWithin = (p: Float64Array, offset: number, radiusArcsec: number): number => {
    const kappaS = p[offset], thetaS = p[offset + 1];
    return 4 * Math.PI * kappaS * thetaS * thetaS * generalisedNfwEnclosedMassFactor(radiusArcsec / thetaS, slopeOf(p, offset));
  };
  return gaussianSumProfile(kind, parameterNames, place, sphericalMassWithin);
}
