// Simulation-based calibration of a config's inference: prior draws, simulations, fits as a batch, ranks and coverage.
export {
  priorSampler, planCalibrationDraws, simulateCalibrationDraws, readCalibrationDraws, drawDataFolder,
  type CalibrationDraw, type CalibrationDrawsRecord,
} from './calibrationDraws.js';
export { configWithValues } from './configWithValues.js';
export { observationAsData } from './observationAsData.js';
export { posteriorCdfAt, posteriorDrawIndices, rankOfTruth, type WeightedPosterior } from './posteriorRank.js';
export { rankUniformity, rankBinCount, type RankUniformity } from './rankUniformity.js';
export { coverageCurve, intervalCoverage, COVERAGE_LEVELS } from './intervalCoverage.js';
export { detectionRates, type DrawDetection } from './detectionRates.js';
export {
  calibrationStatistics, collectCalibration, readDrawPosterior, CALIBRATION_ASSUMPTIONS,
  type CollectSettings, type DrawPosterior, type TruthPlacementRow,
} from './collectCalibration.js';
export { runCalibration, type CalibrationOutcome, type CalibrationSettings } from './runCalibration.js';
