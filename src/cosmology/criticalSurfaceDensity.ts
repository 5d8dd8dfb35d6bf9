import type { FlatLambdaCdm } from './flatLambdaCdm.js';
import { InputError, expectedFound } from '../errors.js';
import {
  arcsecRadians, megaparsecMetres, solarMassParameterSi, speedOfLightMetresPerSecond,
} from './physicalConstants.js';

/** c^2 / (4 pi G) expressed in solar masses per Mpc (so that times 1/Mpc gives M_sun / Mpc^2). */
const surfaceDensityScaleSolarPerMpc =
  (speedOfLightMetresPerSecond * speedOfLightMetresPerSecond * megaparsecMetres) /
  (4 * Math.PI * solarMassParameterSi);

// Critical surface density Sigma_crit = c^2/(4 pi G) D_s/(D_d D_ds) from the three
// angular-diameter distances in Mpc, in M_sun / Mpc^2 (Schneider, Ehlers & Falco 1992, Gravitational Lenses).
export function criticalSurfaceDensityFromDistances(
  lensDistanceMpc: number, sourceDistanceMpc: number, lensToSourceDistanceMpc: number,
): number {
  return (surfaceDensityScaleSolarPerMpc * sourceDistanceMpc) / (lensDistanceMpc * lensToSourceDistanceMpc);
}

function requireLensBeforeSource(lensRedshift: number, sourceRedshift: number): void {
  if (!(Number.isFinite(lensRedshift) && lensRedshift > 0)) {
    throw new InputError(expectedFound('a lens redshift > 0', lensRedshift), { key: 'lensRedshift' });
  }
  if (!(Number.isFinite(sourceRedshift) && sourceRedshift > lensRedshift)) {
    throw new InputError(
      expectedFound(`a source redshift above the lens redshift ${lensRedshift}`, sourceRedshift),
      { key: 'sourceRedshift' },
    );
  }
}

// Sigma_crit in solar masses per Mpc^2 for a lens at z_d and a source at z_s
// (Schneider, Ehlers & Falco 1992, Gravitational Lenses).
export function criticalSurfaceDensitySolarPerMpc2(
  cosmology: FlatLambdaCdm, lensRedshift: number, sourceRedshift: number,
): number {
  requireLensBeforeSource(lensRedshift, sourceRedshift);
  return criticalSurfaceDensityFromDistances(
    cosmology.angularDiameterDistanceMpc(lensRedshift),
    cosmology.angularDiameterDistanceMpc(sourceRedshift),
    cosmology.angularDiameterDistanceBetweenMpc(lensRedshift, sourceRedshift),
  );
}

// Sigma_crit in solar masses per square arcsecond of the lens plane: Sigma_crit (D_d * 1 arcsec)^2.
export function criticalSurfaceDensitySolarPerArcsec2(
  cosmology: FlatLambdaCdm, lensRedshift: number, sourceRedshift: number,
): number {
  const arcsecMpc = cosmology.angularDiameterDistanceMpc(lensRedshift) * arcsecRadians;
  return criticalSurfaceDensitySolarPerMpc2(cosmology, lensRedshift, sourceRedshift) * arcsecMpc * arcsecMpc;
}
