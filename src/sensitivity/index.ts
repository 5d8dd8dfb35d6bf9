// Detection-sensitivity maps: the smallest perturber mass the data would detect, over a grid of positions.
export { LinearAmplitudeChiSquare } from './linearAmplitudeChiSquare.js';
export {
  refitDefaults, PlantedPerturberStatistic, type SmoothBestFit,
} from './plantedPerturberStatistic.js';
export {
  minimumDetectableMass, type DetectableMassSearch, type MinimumDetectableMass,
} from './minimumDetectableMass.js';
export { nearestGridIndex, sensitivityGrid, type SensitivityGrid, type SensitivityPoint } from './sensitivityGrid.js';
export { searchOf, type SensitivityAnswer, type SensitivityTask } from './sensitivityTask.js';
export { computeSensitivity } from './computeSensitivity.js';
export { smoothBestFitFromFolder, smoothBestFitFromRun, type SmoothBestFitSource } from './smoothBestFit.js';
export { massDecadeFractions } from './massDecadeFractions.js';
export { runSensitivityToFolder, type SensitivitySettings } from './runSensitivityToFolder.js';
