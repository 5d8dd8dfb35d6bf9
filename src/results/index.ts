export { credibleInterval } from './credibleInterval.js';
export type { CredibleInterval } from './credibleInterval.js';
export { parameterColumn } from './parameterColumn.js';
export { CREDIBLE_MASS_68, CREDIBLE_MASS_95, parameterSummary } from './parameterSummary.js';
export type { ParameterSummary } from './parameterSummary.js';
export { upperLimit } from './upperLimit.js';
export { weightedQuantile, weightedQuantiles } from './weightedQuantile.js';
export { weightsFromLogWeights } from './weightsFromLogWeights.js';
