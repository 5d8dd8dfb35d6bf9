import type { MassProfile } from '../lens/massProfile.js';
import { nfw } from './nfw.js';
import { pointMass } from './pointMass.js';
import { pseudoJaffe } from './pseudoJaffe.js';
import { truncatedNfw } from './truncatedNfw.js';

export { nfw, truncatedNfw, pseudoJaffe, pointMass };
export {
  nfwProjectionF, nfwConvergenceShape, nfwProjectedMassShape, nfwSmallestRadiusRatio,
} from './nfwProjection.js';
export { duffy2008Concentration, duffy2008FullSampleM200 } from './concentrationMass.js';
export {
  nfwEnclosedMassFactor, truncatedNfwTotalMassFactor, nfwFromMass, writeNfwLensingParameters, subhaloFromMass,
  truncatedNfwTotalMassSolar, nfwMassFromLensing, pointMassEinsteinRadiusArcsec,
  pointMassFromEinsteinRadiusSolar, pseudoJaffeTotalMassSolar, pseudoJaffeStrengthArcsec,
  type NfwFromMass, type SubhaloFromMass, type NfwMassInput, type SubhaloMassInput,
  type NfwMassFromLensing,
} from './subhaloLensing.js';

/** Perturber profiles by the kind name a config uses. */
export const perturberProfiles: Readonly<Record<'nfw' | 'truncatedNfw' | 'pseudoJaffe' | 'pointMass', MassProfile>> =
  Object.freeze({ nfw, truncatedNfw, pseudoJaffe, pointMass });
