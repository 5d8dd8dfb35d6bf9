import { COSMOLOGY_SETS, DEFAULT_COSMOLOGY_SET } from './cosmologySets.js';
import { flatLambdaCdm, type FlatLambdaCdm, type FlatLambdaCdmParameters } from './flatLambdaCdm.js';

/**
 * Planck 2018 TT,TE,EE+lowE+lensing+BAO (Planck Collaboration 2020, A&A 641, A6, Table 2,
 * last column): H0 = 67.66 km/s/Mpc, Omega_m = 0.3111 (cosmologySets.ts). Omega_m here is the
 * total matter density, massive neutrinos included; radiation is neglected. Checked against
 * astropy's Planck18 (which cites that column): same H0, and baryons + CDM 0.30966 plus the
 * 0.06 eV neutrino give 0.31106, i.e. 0.3111 (test/cosmology/referenceValues.test.ts).
 */
export const defaultCosmologyParameters: FlatLambdaCdmParameters = Object.freeze({
  name: `${COSMOLOGY_SETS[DEFAULT_COSMOLOGY_SET].name} (${COSMOLOGY_SETS[DEFAULT_COSMOLOGY_SET].reference})`,
  hubbleConstantKmPerSecPerMpc: COSMOLOGY_SETS[DEFAULT_COSMOLOGY_SET].hubbleConstantKmPerSecPerMpc,
  matterDensity: COSMOLOGY_SETS[DEFAULT_COSMOLOGY_SET].matterDensity,
});

/** The cosmology arcsift uses when a config names none. */
export const defaultCosmology: FlatLambdaCdm = flatLambdaCdm(defaultCosmologyParameters);
