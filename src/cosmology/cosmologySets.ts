import type { FlatLambdaCdmParameters } from './flatLambdaCdm.js';

/** A published cosmology arcsift can be asked for by name. */
export interface CosmologySet extends FlatLambdaCdmParameters {
  /** The config's name for it (`cosmology: planck2018`). */
  readonly key: string;
  readonly name: string;
  /** The paper, table and column the numbers come from. */
  readonly reference: string;
}

/**
 * The named parameter sets. Omega_m is the total matter density today, massive neutrinos
 * included, since arcsift's flat LambdaCDM has matter and Lambda only (radiation is neglected: it
 * changes distances to z = 6 by less than 4e-4, test/cosmology/cosmologySets.test.ts). The tables
 * themselves were not reachable here; the numbers are checked against astropy's copies of them,
 * which name the same tables (test/fixtures/cosmology/make_sets.py).
 */
export const COSMOLOGY_SETS = Object.freeze({
  planck2018: Object.freeze({
    key: 'planck2018',
    name: 'Planck 2018 TT,TE,EE+lowE+lensing+BAO',
    reference: 'Planck Collaboration 2020, A&A 641, A6, Table 2, last column',
    hubbleConstantKmPerSecPerMpc: 67.66,
    matterDensity: 0.3111,
  }),
  wmap9: Object.freeze({
    key: 'wmap9',
    name: 'WMAP nine-year WMAP+eCMB+BAO+H0',
    reference: 'Hinshaw et al. 2013, ApJS 208, 19, Table 4, last column',
    hubbleConstantKmPerSecPerMpc: 69.32,
    matterDensity: 0.2865,
  }),
} satisfies Record<string, CosmologySet>);

export type CosmologySetKey = keyof typeof COSMOLOGY_SETS;

/** The set arcsift uses when a config names none. */
export const DEFAULT_COSMOLOGY_SET: CosmologySetKey = 'planck2018';
