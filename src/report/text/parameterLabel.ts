/** How a parameter is named in figures and tables: the component it belongs to and the quantity with its unit. */
export interface ParameterLabel {
  /** E.g. `lens.mass[0]`; empty for a name without dots. */
  readonly component: string;
  /** E.g. `einstein radius`. */
  readonly quantity: string;
  /** E.g. `arcsec`; empty for a dimensionless parameter; `M/Msun` for a log10 mass in log10(M/Msun). */
  readonly unit: string;
  /** Quantity and unit in one, e.g. `einstein radius [arcsec]`. */
  readonly withUnit: string;
}

/** Unit words arcsift appends to parameter names; the unit is shown apart, so the suffix is dropped. */
const UNIT_SUFFIX = /(Arcsec|Deg|Rad|Solar|Kpc|Mpc|Pixels)$/;

/**
 * Splits a dotted arcsift parameter name, e.g. `lens.mass[0].einsteinRadiusArcsec` with unit
 * `arcsec`, into `lens.mass[0]` and `einstein radius [arcsec]`.
 */
export function parameterLabel(name: string, unit: string): ParameterLabel {
  const dot = name.lastIndexOf('.');
  const component = dot < 0 ? '' : name.slice(0, dot);
  const leaf = dot < 0 ? name : name.slice(dot + 1);
  const stem = leaf.replace(UNIT_SUFFIX, '') || leaf;
  const quantity = stem
    .replace(/^log10/, 'log10 ')
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .toLowerCase()
    .trim();
  // A log quantity whose unit repeats the log, e.g. log10 mass in log10(M/Msun), shows the unit inside: [M/Msun].
  const logged = /^log10\((.+)\)$/.exec(unit);
  const shown = logged !== null && quantity.startsWith('log10') ? logged[1] : unit;
  return { component, quantity, unit: shown, withUnit: shown === '' ? quantity : `${quantity} [${shown}]` };
}
