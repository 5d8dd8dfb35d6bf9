export type { Prior, PriorKind, PriorSpec } from './prior.js';
export type { PriorPlace } from './priorChecks.js';
export { makePrior, PRIOR_KINDS } from './makePrior.js';
export { uniformPrior } from './uniform.js';
export { logUniformPrior } from './logUniform.js';
export { normalPrior } from './normal.js';
export { truncatedNormalPrior } from './truncatedNormal.js';
export { fixedPrior } from './fixed.js';
export { periodicPrior, wrapIntoPeriod } from './periodic.js';
