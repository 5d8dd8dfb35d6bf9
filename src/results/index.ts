export { bayesFactorReading, evidenceGrade, KASS_RAFTERY_LN_EDGES } from './bayesFactorReading.js';
export type { BayesFactorReading, EvidenceGrade } from './bayesFactorReading.js';
export { cornerData } from './cornerData.js';
export { evidenceTrace } from './evidenceTrace.js';
export type { EvidenceTrace } from './evidenceTrace.js';
export type { CornerData, CornerOptions, CornerPair, CornerParameter } from './cornerData.js';
export { credibleInterval } from './credibleInterval.js';
export type { CredibleInterval } from './credibleInterval.js';
export { densityLevels, MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D } from './densityLevels.js';
export type { DensityLevelOptions } from './densityLevels.js';
export { parameterColumn } from './parameterColumn.js';
export { CREDIBLE_MASS_68, CREDIBLE_MASS_95, parameterSummary } from './parameterSummary.js';
export type { ParameterSummary } from './parameterSummary.js';
export { bayesFactorBoundFromPValue, lnPValueBound, significanceBound, twoSidedSigmaFromLnP } from './significanceBound.js';
export type { SignificanceBound } from './significanceBound.js';
export { smoothHistogram2d } from './smoothHistogram2d.js';
export { upperLimit } from './upperLimit.js';
export { weightedHistogram1d, weightedHistogram2d } from './weightedHistogram.js';
export type { AxisRange, Histogram1d, Histogram2d } from './weightedHistogram.js';
export { weightedQuantile, weightedQuantiles } from './weightedQuantile.js';
export {
  EQUAL_WEIGHT_SAMPLES_TITLE,
  formatEqualWeightSamplesCsv,
  formatWeightedSamplesCsv,
  WEIGHTED_SAMPLES_TITLE,
  writeEqualWeightSamplesCsv,
  writeWeightedSamplesCsv,
} from './writeSamplesCsv.js';
export type { EqualWeightSamplesTable, WeightedSamplesTable } from './writeSamplesCsv.js';
