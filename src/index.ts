// arcsift's library API: everything a command does is reachable from here.
export { InputError, type InputErrorPlace } from './errors.js';
export * from './cosmology/index.js';
export * from './lens/index.js';
export * from './perturber/index.js';
export * from './light/index.js';
export * from './fits/index.js';
export { loadConfig, parseConfig, type ArcsiftConfig } from './config/arcsiftConfig.js';
export { buildLensSystem, type LensSystem } from './model/lensSystem.js';
export { ForwardModel } from './model/forwardModel.js';
export { simulateObservation, type Simulation } from './model/simulateObservation.js';
export { simulateToFolder } from './model/simulateToFolder.js';
export { MarginalisedAmplitudes } from './likelihood/marginalisedAmplitudes.js';
