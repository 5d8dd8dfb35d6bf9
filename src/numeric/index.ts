// General numerics of arcsift (no lensing, no files): one file per method, grouped by kind.
export { choleskyFactor, choleskySolveInPlace, forwardSubstitute } from './linearAlgebra/choleskyFactor.js';
export { choleskyWithRidge } from './linearAlgebra/choleskyWithRidge.js';
export { gaussLegendre } from './quadrature/gaussLegendre.js';
export { integrateAdaptiveGaussLegendre } from './quadrature/adaptiveGaussLegendre.js';
export { SeededStream, type StreamState } from './random/seededStream.js';
export { derivedSeed } from './random/derivedSeed.js';
export { equalWeightResample, type EqualWeightSamples } from './resampling/equalWeightResample.js';
export { enclosingLevels } from './statistics/enclosingLevels.js';
export { kishEffectiveSampleSize } from './statistics/kishEffectiveSampleSize.js';
export { kolmogorovSmirnovPValue, kolmogorovSmirnovUniform } from './statistics/kolmogorovSmirnov.js';
export { logAddExp, logSumExp } from './statistics/logSumExp.js';
export { quantileOfSorted } from './statistics/quantileOfSorted.js';
export { weightsFromLogWeights } from './statistics/weightsFromLogWeights.js';
export { standardNormalQuantile, upperTail, logUpperTail, upperTailQuantileFromLog } from './special/standardNormal.js';
export { nelderMead, type NelderMeadOptions, type NelderMeadResult } from './optimisation/nelderMead.js';
export { contourRegion, binCentres, type ContourRegion, type GridValues } from './contour/contourRegion.js';
