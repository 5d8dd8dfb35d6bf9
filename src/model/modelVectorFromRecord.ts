import { InputError } from '../errors.js';
import type { LensSystem } from './lensSystem.js';

/**
 * The model vector of `system` from a record of parameter name -> value in physical units (a
 * run's `bestFit`). Every parameter of the system is looked up by name; a missing or non-finite
 * value throws an InputError naming `file` and `key`.name.
 */
export function modelVectorFromRecord(system: LensSystem, record: Readonly<Record<string, unknown>>, file: string, key: string): Float64Array {
  return Float64Array.from(system.parameters, (p) => {
    const v = record[p.name];
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      throw new InputError(`best fit: expected a number for the config's parameter ${p.name}, found ${v === undefined ? 'nothing' : JSON.stringify(v)}`, { file, key: `${key}.${p.name}` });
    }
    return v;
  });
}
