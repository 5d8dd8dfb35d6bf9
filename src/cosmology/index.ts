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
