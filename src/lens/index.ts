// Main-lens mass profiles: the contract, the profiles, and the table configs name them by.
import { externalShear } from './externalShear.js';
import { isothermalEllipsoid } from './isothermalEllipsoid.js';
import type { MassProfile } from './massProfile.js';
import { powerLawEllipsoid } from './powerLawEllipsoid.js';

export type { MassProfile } from './massProfile.js';
export { externalShear } from './externalShear.js';
export { isothermalEllipsoid } from './isothermalEllipsoid.js';
export { powerLawEllipsoid } from './powerLawEllipsoid.js';
export { multipole, multipoleOrders, type MultipoleOrder } from './multipole.js';

/** Config kind names of the main-lens profiles (multipoles are built by `multipole(order)`). */
export type MainLensKind = 'isothermalEllipsoid' | 'powerLawEllipsoid' | 'externalShear';

/** The main-lens profiles by config kind name. */
export const mainLensProfiles: Readonly<Record<MainLensKind, MassProfile>> = Object.freeze({
  isothermalEllipsoid,
  powerLawEllipsoid,
  externalShear,
});
