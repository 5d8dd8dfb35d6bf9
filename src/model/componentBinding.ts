import { InputError } from '../errors.js';
import type { ComponentConfig } from '../config/arcsiftConfig.js';
import type { ModelParameter } from './modelParameter.js';
import { unitOfParameter } from './modelParameter.js';

/**
 * Collects model parameters while components are bound, and maps each component's config
 * entries onto model-vector indices. A component binds its profile's parameter names; the
 * names it declares `linked` are filled from another component instead of the config.
 */
export class ParameterCollector {
  readonly parameters: ModelParameter[] = [];

  constructor(private readonly file: string) {}

  add(name: string, value: number | undefined, prior: ModelParameter['prior']): number {
    this.parameters.push({ name, unit: unitOfParameter(name), value, prior });
    return this.parameters.length - 1;
  }

  /**
   * Binds the config entries of `component` to the parameter names `names` and returns the
   * model index of each name. `defaults` gives values for names that may be left out.
   * Keys of the component that are not in `names` (nor in `extraKeys`) are errors.
   */
  bind(
    component: ComponentConfig,
    names: readonly string[],
    defaults: Readonly<Record<string, number>> = {},
    extraKeys: readonly string[] = [],
  ): number[] {
    for (const key of Object.keys(component.entries)) {
      if (!names.includes(key) && !extraKeys.includes(key)) {
        throw new InputError(
          `unknown parameter for a ${component.kind} (its parameters: ${names.join(', ')})`,
          { file: this.file, key: `${component.key}.${key}` },
        );
      }
    }
    return names.map((name) => {
      const entry = component.entries[name];
      if (entry === undefined) {
        if (name in defaults) return this.add(`${component.key}.${name}`, defaults[name], undefined);
        throw new InputError(`missing parameter ${name} of a ${component.kind}`, { file: this.file, key: component.key });
      }
      return this.add(entry.key, entry.value, entry.prior);
    });
  }
}

/** Copies model-vector entries into a profile vector: profile[offset + k] = model[indices[k]]. */
export function copyWriter(indices: readonly number[], offset: number): (model: Float64Array, profile: Float64Array) => void {
  const from = Int32Array.from(indices);
  return (model, profile) => {
    for (let k = 0; k < from.length; k++) profile[offset + k] = model[from[k]];
  };
}
