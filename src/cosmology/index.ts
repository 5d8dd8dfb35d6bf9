export * from './physicalConstants.js';
export {
  flatLambdaCdm, distanceRelativeAccuracy, type FlatLambdaCdm, type FlatLambdaCdmParameters,
} from './flatLambdaCdm.js';
export {
  criticalSurfaceDensityFromDistances, criticalSurfaceDensitySolarPerMpc2,
  criticalSurfaceDensitySolarPerArcsec2,
} from './criticalSurfaceDensity.js';
export { defaultCosmology, defaultCosmologyParameters } from './defaultCosmology.js';
export { lensingContext, type LensingContext } from './lensingContext.js';
export { COSMOLOGY_SETS, DEFAULT_COSMOLOGY_SET, type CosmologySet, type CosmologySetKey } from './cosmologySets.js';
export { configuredCosmology, type CosmologyRecord } from './configuredCosmology.js';
