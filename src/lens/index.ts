// Main-lens mass profiles: the contract, the profiles, and the table configs name them by.
import { externalShear } from './externalShear.js';
import { isothermalEllipsoid } from './isothermalEllipsoid/isothermalEllipsoid.js';
import { fastIsothermalEllipsoid } from './isothermalEllipsoid/fastIsothermalEllipsoid.js';
import { referenceOnly, type MassProfilePair } from './massProfile.js';
import { powerLawEllipsoid } from './powerLawEllipsoid.js';
import { stellarSersic } from './stellarMass/stellarSersic.js';
import { fastStellarSersic } from './stellarMass/fastStellarSersic.js';
import { nfwHalo } from './darkHalo/nfwHalo.js';
import { fastNfwHalo } from './darkHalo/fastNfwHalo.js';
import { generalisedNfwHalo } from './darkHalo/generalisedNfwHalo.js';
import { fastGeneralisedNfwHalo } from './darkHalo/fastGeneralisedNfwHalo.js';

export { referenceOnly, type MassProfile, type MassProfilePair } from './massProfile.js';
export { externalShear } from './externalShear.js';
export { isothermalEllipsoid } from './isothermalEllipsoid/isothermalEllipsoid.js';
export { fastIsothermalEllipsoid } from './isothermalEllipsoid/fastIsothermalEllipsoid.js';
export { powerLawEllipsoid } from './powerLawEllipsoid.js';
export { multipole, multipoleOrders, type MultipoleOrder } from './multipole.js';
export { stellarSersic, fastStellarSersic, nfwHalo, fastNfwHalo, generalisedNfwHalo, fastGeneralisedNfwHalo };
export { sersicMassShape, sersicMassShapeTotal, sersicRoot } from './stellarMass/sersicMassShape.js';
export { generalisedNfwEnclosedMassFactor } from './darkHalo/generalisedNfwEnclosedMass.js';
export { generalisedNfwConvergenceShape } from './darkHalo/generalisedNfwProjection.js';

/**
 * Config kind names of the main-lens profiles (multipoles are built by `multipole(order)`). The
 * decomposed lens's components, stellarSersic, nfwHalo and generalisedNfwHalo, are written in
 * physical units in a config (solar masses, concentration) and bound by model/mainLensBinding.ts
 * to the lensing-unit parameters their profiles read, as perturbers are.
 */
export type MainLensKind =
  | 'isothermalEllipsoid' | 'powerLawEllipsoid' | 'externalShear'
  | 'stellarSersic' | 'nfwHalo' | 'generalisedNfwHalo';

/** The main-lens profiles by config kind name: each reference formula and its fast evaluation. */
export const mainLensProfiles: Readonly<Record<MainLensKind, MassProfilePair>> = Object.freeze({
  isothermalEllipsoid: Object.freeze({ reference: isothermalEllipsoid, fast: fastIsothermalEllipsoid }),
  powerLawEllipsoid: referenceOnly(powerLawEllipsoid),
  externalShear: referenceOnly(externalShear),
  stellarSersic: Object.freeze({ reference: stellarSersic, fast: fastStellarSersic }),
  nfwHalo: Object.freeze({ reference: nfwHalo, fast: fastNfwHalo }),
  generalisedNfwHalo: Object.freeze({ reference: generalisedNfwHalo, fast: fastGeneralisedNfwHalo }),
});
