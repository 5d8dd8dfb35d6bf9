import { InputError } from '../errors.js';
import type { LensSystem } from './lensSystem.js';
import { ParameterSpace } from '../priors/parameterSpace.js';
import type { PriorSpec } from '../priors/prior.js';

/**
 * The sampling space of an assembled model: every parameter with a prior in the config is
 * sampled; a parameter with only a value is held fixed at it. Bad priors are reported against
 * the config file and key.
 */
export function modelParameterSpace(system: LensSystem): ParameterSpace {
  const entries = system.parameters.map((parameter) => {
    let prior: PriorSpec;
    if (parameter.prior !== undefined) {
      prior = parameter.prior;
    } else if (parameter.value !== undefined) {
      prior = { kind: 'fixed', value: parameter.value };
    } else {
      throw new InputError('a parameter needs a prior or a value', { file: system.file, key: parameter.name });
    }
    return { name: parameter.name, prior };
  });
  try {
    return new ParameterSpace(entries);
  } catch (error) {
    if (error instanceof InputError) throw new InputError(error.message, { file: system.file });
    throw error;
  }
}
