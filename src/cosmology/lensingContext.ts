import type { FlatLambdaCdm } from './flatLambdaCdm.js';
import { criticalSurfaceDensitySolarPerMpc2 } from './criticalSurfaceDensity.js';
import { arcsecRadians } from './physicalConstants.js';

/**
 * Everything a mass-to-lensing conversion needs about one lens and source redshift pair,
 * computed once (it involves the distance integrals) and then only read.
 */
export interface LensingContext {
  readonly cosmologyName: string;
  readonly lensRedshift: number;
  readonly sourceRedshift: number;
  /** H0 / (100 km/s/Mpc), for relations quoted in h^-1 units. */
  readonly littleH: number;
  /** Angular-diameter distances D_d, D_s, D_ds. */
  readonly lensDistanceMpc: number;
  readonly sourceDistanceMpc: number;
  readonly lensToSourceDistanceMpc: number;
  readonly criticalSurfaceDensitySolarPerMpc2: number;
  readonly criticalSurfaceDensitySolarPerArcsec2: number;
  /** Critical density of the universe at the lens redshift. */
  readonly criticalDensitySolarPerMpc3: number;
  /** Proper size of one arcsecond in the lens plane, in Mpc and kpc. */
  readonly mpcPerArcsec: number;
  readonly kpcPerArcsec: number;
}

// Distances, Sigma_crit (Schneider, Ehlers & Falco 1992, Gravitational Lenses) and rho_crit(z_d) for one lens system.
export function lensingContext(
  cosmology: FlatLambdaCdm, lensRedshift: number, sourceRedshift: number,
): LensingContext {
  const sigmaCritMpc2 = criticalSurfaceDensitySolarPerMpc2(cosmology, lensRedshift, sourceRedshift);
  const lensDistanceMpc = cosmology.angularDiameterDistanceMpc(lensRedshift);
  const mpcPerArcsec = lensDistanceMpc * arcsecRadians;
  return Object.freeze({
    cosmologyName: cosmology.name,
    lensRedshift,
    sourceRedshift,
    littleH: cosmology.hubbleConstantKmPerSecPerMpc / 100,
    lensDistanceMpc,
    sourceDistanceMpc: cosmology.angularDiameterDistanceMpc(sourceRedshift),
    lensToSourceDistanceMpc: cosmology.angularDiameterDistanceBetweenMpc(lensRedshift, sourceRedshift),
    criticalSurfaceDensitySolarPerMpc2: sigmaCritMpc2,
    criticalSurfaceDensitySolarPerArcsec2: sigmaCritMpc2 * mpcPerArcsec * mpcPerArcsec,
    criticalDensitySolarPerMpc3: cosmology.criticalDensitySolarPerMpc3(lensRedshift),
    mpcPerArcsec,
    kpcPerArcsec: 1000 * mpcPerArcsec,
  });
}
