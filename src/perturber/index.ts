import { referenceOnly, type MassProfilePair } from '../lens/massProfile.js';
import { fastTruncatedNfw } from './truncatedNfw/fastTruncatedNfw.js';
import { nfw } from './nfw.js';
import { pointMass } from './pointMass.js';
import { pseudoJaffe } from './pseudoJaffe.js';
import { truncatedNfw } from './truncatedNfw/truncatedNfw.js';

export { nfw, truncatedNfw, fastTruncatedNfw, pseudoJaffe, pointMass };
export {
  nfwProjectionF, nfwConvergenceShape, nfwProjectedMassShape, nfwSmallestRadiusRatio,
} from '../lens/darkHalo/nfwProjection.js';
export { duffy2008Concentration, duffy2008FullSampleM200 } from './concentrationMass.js';
export { tidalTruncationRadius } from './tidalTruncationRadius.js';
export { hostSphericalMassSolar, type HostComponent } from './hostSphericalMass.js';
export {
  nfwEnclosedMassFactor, truncatedNfwTotalMassFactor, nfwFromMass, writeNfwLensingParameters, subhaloFromMass,
  writeGeneralisedNfwLensingParameters,
  truncatedNfwTotalMassSolar, nfwMassFromLensing, pointMassEinsteinRadiusArcsec,
  pointMassFromEinsteinRadiusSolar, pseudoJaffeTotalMassSolar, pseudoJaffeStrengthArcsec,
  type NfwFromMass, type SubhaloFromMass, type NfwMassInput, type SubhaloMassInput,
  type NfwMassFromLensing,
} from './subhaloLensing.js';

/** Perturber profiles by the kind name a config uses: each reference formula and its fast evaluation. */
export const perturberProfiles: Readonly<Record<'nfw' | 'truncatedNfw' | 'pseudoJaffe' | 'pointMass', MassProfilePair>> =
  Object.freeze({
    nfw: referenceOnly(nfw),
    truncatedNfw: Object.freeze({ reference: truncatedNfw, fast: fastTruncatedNfw }),
    pseudoJaffe: referenceOnly(pseudoJaffe),
    pointMass: referenceOnly(pointMass),
  });
