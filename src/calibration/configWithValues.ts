import type { ArcsiftConfig, ComponentConfig } from '../config/arcsiftConfig.js';

/**
 * The config with the given parameter values (by model parameter name, the dotted config key)
 * in place of its `value`s, priors kept, and only its first `perturberCount` perturbers: the
 * scenario `simulate` makes of one draw. A name that no component has is added to its
 * component (a perturber centre given by a region prior has no entry of its own).
 */
export function configWithValues(config: ArcsiftConfig, values: ReadonlyMap<string, number>, perturberCount: number): ArcsiftConfig {
  const set = (component: ComponentConfig): ComponentConfig => {
    const entries = { ...component.entries };
    const prefix = `${component.key}.`;
    for (const [name, value] of values) {
      if (!name.startsWith(prefix)) continue;
      const local = name.slice(prefix.length);
      if (local.includes('.')) continue;
      entries[local] = { key: name, value, prior: entries[local]?.prior };
    }
    return { ...component, entries };
  };
  return {
    ...config,
    lensMass: config.lensMass.map(set),
    shear: config.shear === undefined ? undefined : set(config.shear),
    multipoles: config.multipoles.map(set),
    lensLight: config.lensLight.map(set),
    sourceLight: config.sourceLight.map(set),
    perturbers: config.perturbers.slice(0, perturberCount).map(set),
  };
}
