import { InputError, expectedFound } from '../errors.js';
import { integrateAdaptiveGaussLegendre } from '../numeric/quadrature/adaptiveGaussLegendre.js';
import {
  arcsecRadians, megaparsecMetres, solarMassParameterSi, speedOfLightMetresPerSecond,
} from './physicalConstants.js';

/** The two numbers that fix a flat LambdaCDM universe without radiation. */
export interface FlatLambdaCdmParameters {
  /** Hubble constant H0 in km s^-1 Mpc^-1. */
  readonly hubbleConstantKmPerSecPerMpc: number;
  /** Matter density parameter Omega_m today (dimensionless); Omega_Lambda = 1 - Omega_m. */
  readonly matterDensity: number;
  /** Optional label saying where the numbers come from. */
  readonly name?: string;
}

/** A flat LambdaCDM cosmology: distances in Mpc, densities in solar masses per Mpc^3. */
export interface FlatLambdaCdm extends FlatLambdaCdmParameters {
  readonly name: string;
  /** Omega_Lambda = 1 - Omega_m. */
  readonly darkEnergyDensity: number;
  /** Hubble distance c / H0 in Mpc. */
  readonly hubbleDistanceMpc: number;
  /** Dimensionless Hubble parameter E(z) = H(z) / H0. */
  expansionRate(redshift: number): number;
  /** Line-of-sight comoving distance from redshift 0 to z. */
  comovingDistanceMpc(redshift: number): number;
  /** Comoving distance between two redshifts z1 <= z2. */
  comovingDistanceBetweenMpc(redshift1: number, redshift2: number): number;
  /** Angular-diameter distance from the observer to z. */
  angularDiameterDistanceMpc(redshift: number): number;
  /** Angular-diameter distance from z1 to z2 (z1 <= z2), as seen from z2's emitter at z1. */
  angularDiameterDistanceBetweenMpc(redshift1: number, redshift2: number): number;
  /** Critical density of the universe 3 H(z)^2 / (8 pi G) at z, solar masses per Mpc^3. */
  criticalDensitySolarPerMpc3(redshift: number): number;
  /** Proper transverse size, in kpc, of one arcsecond at z. */
  kpcPerArcsec(redshift: number): number;
}

/** Relative accuracy asked of every distance integral (distances must be good to 1e-8 relative). */
export const distanceRelativeAccuracy = 1e-10;

function requireRedshift(redshift: number, key: string): void {
  if (!Number.isFinite(redshift) || redshift < 0) {
    throw new InputError(expectedFound('a finite redshift >= 0', redshift), { key });
  }
}

// Flat LambdaCDM without radiation: E(z) = sqrt(Omega_m (1+z)^3 + 1 - Omega_m), D_C = (c/H0)
// int_0^z dz'/E(z'), D_A = D_C/(1+z), D_A(z1,z2) = (D_C(z2) - D_C(z1))/(1+z2) (Hogg 1999,
// astro-ph/9905116, eqs. 14-16, 18-19 with Omega_k = 0). The paper was not reachable here: the
// equation numbers agree with other citations of it, and the formulas are tested against astropy.
export function flatLambdaCdm(parameters: FlatLambdaCdmParameters): FlatLambdaCdm {
  const hubbleConstant = parameters.hubbleConstantKmPerSecPerMpc;
  const matter = parameters.matterDensity;
  if (!Number.isFinite(hubbleConstant) || hubbleConstant <= 0) {
    throw new InputError(
      expectedFound('a Hubble constant > 0 in km/s/Mpc', hubbleConstant),
      { key: 'hubbleConstantKmPerSecPerMpc' },
    );
  }
  if (!Number.isFinite(matter) || matter < 0 || matter > 1) {
    throw new InputError(
      expectedFound('a matter density parameter between 0 and 1', matter),
      { key: 'matterDensity' },
    );
  }
  const darkEnergy = 1 - matter;
  const hubbleDistanceMpc = speedOfLightMetresPerSecond / 1000 / hubbleConstant;
  const hubbleConstantPerSecond = (hubbleConstant * 1000) / megaparsecMetres;
  // 3 H0^2 / (8 pi G) in solar masses per Mpc^3: multiplying by Mpc^3 / M_sun turns G into GM_sun.
  const criticalDensityToday =
    (3 * hubbleConstantPerSecond * hubbleConstantPerSecond * megaparsecMetres ** 3) /
    (8 * Math.PI * solarMassParameterSi);

  const expansionRate = (z: number): number => {
    const onePlusZ = 1 + z;
    return Math.sqrt(matter * onePlusZ * onePlusZ * onePlusZ + darkEnergy);
  };
  const inverseExpansionRate = (z: number): number => 1 / expansionRate(z);
  const comovingDistanceBetweenMpc = (z1: number, z2: number): number => {
    requireRedshift(z1, 'redshift');
    requireRedshift(z2, 'redshift');
    return hubbleDistanceMpc *
      integrateAdaptiveGaussLegendre(inverseExpansionRate, z1, z2, distanceRelativeAccuracy);
  };
  const comovingDistanceMpc = (z: number): number => comovingDistanceBetweenMpc(0, z);
  const angularDiameterDistanceMpc = (z: number): number => comovingDistanceMpc(z) / (1 + z);
  const angularDiameterDistanceBetweenMpc = (z1: number, z2: number): number => {
    if (z2 < z1) {
      throw new InputError(expectedFound(`a second redshift >= the first (${z1})`, z2), { key: 'redshift' });
    }
    return comovingDistanceBetweenMpc(z1, z2) / (1 + z2);
  };

  return Object.freeze({
    name: parameters.name ?? `flat LambdaCDM (H0 = ${hubbleConstant}, Omega_m = ${matter})`,
    hubbleConstantKmPerSecPerMpc: hubbleConstant,
    matterDensity: matter,
    darkEnergyDensity: darkEnergy,
    hubbleDistanceMpc,
    expansionRate,
    comovingDistanceMpc,
    comovingDistanceBetweenMpc,
    angularDiameterDistanceMpc,
    angularDiameterDistanceBetweenMpc,
    criticalDensitySolarPerMpc3: (z: number): number => {
      requireRedshift(z, 'redshift');
      const e = expansionRate(z);
      return criticalDensityToday * e * e;
    },
    kpcPerArcsec: (z: number): number => angularDiameterDistanceMpc(z) * 1000 * arcsecRadians,
  });
}
