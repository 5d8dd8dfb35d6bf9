import type { ConfiguredPrior } from '../config/parameterEntry.js';

/** One parameter of an assembled model, in the order of the model vector. */
export interface ModelParameter {
  /** Dotted config key, e.g. `lens.mass[0].einsteinRadiusArcsec`; unique in a model. */
  readonly name: string;
  /** Unit for tables and CSV headers. */
  readonly unit: string;
  /** Value from the config (the truth for `simulate`); undefined when only a prior is given. */
  readonly value: number | undefined;
  /** Prior from the config; undefined means the parameter is held at `value`. */
  readonly prior: ConfiguredPrior | undefined;
}

/** Unit of a parameter, read from the suffix of its name (names carry their units). */
export function unitOfParameter(name: string): string {
  if (name.endsWith('Arcsec')) return 'arcsec';
  if (name.endsWith('Deg')) return 'deg';
  // log10MassSolar, log10M200Solar, log10StellarMassSolar: the last segment of the dotted name.
  if (/(^|\.)log10\w*Solar$/.test(name)) return 'log10(M/Msun)';
  return '';
}
