import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { InputError, expectedFound } from '../errors.js';
import { COSMOLOGY_SETS, DEFAULT_COSMOLOGY_SET, type CosmologySet } from './cosmologySets.js';
import { flatLambdaCdm, type FlatLambdaCdm } from './flatLambdaCdm.js';

/** The cosmology of a run as its records give it. */
export interface CosmologyRecord {
  /** The set's name in configs (planck2018, wmap9), or null for explicit values. */
  readonly set: string | null;
  readonly name: string;
  /** The paper, table and column of a named set; null for explicit values. */
  readonly reference: string | null;
  readonly hubbleConstantKmPerSecPerMpc: number;
  readonly matterDensity: number;
  readonly darkEnergyDensity: number;
}

/**
 * The flat LambdaCDM a config asks for (its named set, its explicit values, or by default
 * Planck 2018) and its record. An unknown set name is an InputError naming the config and key.
 */
export function configuredCosmology(config: Pick<ArcsiftConfig, 'cosmology' | 'file'>): { readonly model: FlatLambdaCdm; readonly record: CosmologyRecord } {
  const chosen = config.cosmology ?? { set: DEFAULT_COSMOLOGY_SET };
  let set: CosmologySet | undefined;
  if ('set' in chosen) {
    set = (COSMOLOGY_SETS as Readonly<Record<string, CosmologySet>>)[chosen.set];
    if (set === undefined) {
      throw new InputError(
        `no such cosmology: ${expectedFound(`one of ${Object.keys(COSMOLOGY_SETS).join(', ')}, or { hubbleConstant, matterDensity }`, chosen.set)}`,
        { file: config.file, key: 'cosmology' },
      );
    }
  }
  const values = set ?? (chosen as { hubbleConstantKmPerSecPerMpc: number; matterDensity: number });
  const name = set === undefined ? `flat LambdaCDM from ${config.file}` : set.name;
  const model = flatLambdaCdm({ ...values, name: set === undefined ? name : `${set.name} (${set.reference})` });
  return {
    model,
    record: {
      set: set?.key ?? null,
      name,
      reference: set?.reference ?? null,
      hubbleConstantKmPerSecPerMpc: model.hubbleConstantKmPerSecPerMpc,
      matterDensity: model.matterDensity,
      darkEnergyDensity: model.darkEnergyDensity,
    },
  };
}
