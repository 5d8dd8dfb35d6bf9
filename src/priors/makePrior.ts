import { expectedFound } from '../errors.js';
import { fixedPrior } from './fixed.js';
import { logUniformPrior } from './logUniform.js';
import { normalPrior } from './normal.js';
import { periodicPrior } from './periodic.js';
import type { Prior, PriorKind, PriorSpec } from './prior.js';
import { priorError, type PriorPlace } from './priorChecks.js';
import { truncatedNormalPrior } from './truncatedNormal.js';
import { uniformPrior } from './uniform.js';

export const PRIOR_KINDS: readonly PriorKind[] = Object.freeze([
  'uniform', 'logUniform', 'normal', 'truncatedNormal', 'fixed', 'periodic',
]);

/**
 * Builds and validates the prior of parameter `name`. Bad specifications (inverted or equal
 * bounds, non-positive log-uniform bounds, sigma <= 0, non-finite numbers, a truncation window
 * with no probability, an unknown kind) throw InputError naming the parameter; `place.key`
 * (a config key path) is attached when given.
 */
export function makePrior(name: string, spec: PriorSpec, place: PriorPlace = {}): Prior {
  const kind = (spec as { kind?: unknown } | null | undefined)?.kind;
  switch (kind) {
    case 'uniform': return uniformPrior(name, spec as Extract<PriorSpec, { kind: 'uniform' }>, place);
    case 'logUniform': return logUniformPrior(name, spec as Extract<PriorSpec, { kind: 'logUniform' }>, place);
    case 'normal': return normalPrior(name, spec as Extract<PriorSpec, { kind: 'normal' }>, place);
    case 'truncatedNormal':
      return truncatedNormalPrior(name, spec as Extract<PriorSpec, { kind: 'truncatedNormal' }>, place);
    case 'fixed': return fixedPrior(name, spec as Extract<PriorSpec, { kind: 'fixed' }>, place);
    case 'periodic': return periodicPrior(name, spec as Extract<PriorSpec, { kind: 'periodic' }>, place);
    default:
      throw priorError(name, `kind: ${expectedFound(`one of ${PRIOR_KINDS.join(', ')}`, kind)}`, place);
  }
}
