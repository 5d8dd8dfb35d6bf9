// Main-lens mass profiles: the contract, the profiles, and the table configs name them by.
import { externalShear } from './externalShear.js';
import { isothermalEllipsoid } from './isothermalEllipsoid/isothermalEllipsoid.js';
import { fastIsothermalEllipsoid } from './isothermalEllipsoid/fastIsothermalEllipsoid.js';
import { referenceOnly, type MassProfilePair } from './massProfile.js';
import { powerLawEllipsoid } from './powerLawEllipsoid.js';

export { referenceOnly, type MassProfile, type MassProfilePair } from './massProfile.js';
export { externalShear } from './externalShear.js';
export { isothermalEllipsoid } from './isothermalEllipsoid/isothermalEllipsoid.js';
export { fastIsothermalEllipsoid } from './isothermalEllipsoid/fastIsothermalEllipsoid.js';
export { powerLawEllipsoid } from './powerLawEllipsoid.js';
export { multipole, multipoleOrders, type MultipoleOrder } from './multipole.js';

/** Config kind names of the main-lens profiles (multipoles are built by `multipole(order)`). */
export type MainLensKind = 'isothermalEllipsoid' | 'powerLawEllipsoid' | 'externalShear';

/** The main-lens profiles by config kind name: each reference formula and its fast evaluation. */
export const mainLensProfiles: Readonly<Record<MainLensKind, MassProfilePair>> = Object.freeze({
  isothermalEllipsoid: Object.freeze({ reference: isothermalEllipsoid, fast: fastIsothermalEllipsoid }),
  powerLawEllipsoid: referenceOnly(powerLawEllipsoid),
  externalShear: referenceOnly(externalShear),
});
