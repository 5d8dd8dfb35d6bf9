export * from './priors/index.js';
export { ParameterSpace } from './parameterSpace.js';
export type { ParameterEntry, PriorDescription } from './parameterSpace.js';
export * from './diagnostics/index.js';
export * from './ensemble/index.js';
export * from './nested/index.js';
