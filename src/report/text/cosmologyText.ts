import type { CosmologyRecord } from '../../cosmology/configuredCosmology.js';

/** A run's cosmology in one line: its name, H0, Omega_m and, for a named set, where the numbers come from. */
export function cosmologyText(cosmology: CosmologyRecord): string {
  const values = `H0 = ${cosmology.hubbleConstantKmPerSecPerMpc} km/s/Mpc, Omega_m = ${cosmology.matterDensity}, flat`;
  return `${cosmology.name}: ${values}${cosmology.reference === null ? '' : ` (${cosmology.reference})`}`;
}
