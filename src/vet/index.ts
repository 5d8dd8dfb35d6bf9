// Vetting network flags: flag lists and probability maps, one perturbed fit per flag against one smooth fit.
export {
  columnToXArcsec, imageHalfExtentArcsec, pixelOfPosition, rowToYArcsec, type FlagCandidate, type FlagGrid,
} from './flagCandidate.js';
export { FLAG_LIST_COLUMNS, readFlagList } from './readFlagList.js';
export { isProbabilityMapFile, readProbabilityMap, type ProbabilityMap } from './readProbabilityMap.js';
export { mapCandidates, type MapCandidateSettings } from './mapCandidates.js';
export { readFlags, type FlagSet } from './readFlags.js';
export { MapPositionPrior } from './mapPositionPrior.js';
export { firstPerturber, perturberPositionConfig, windowAround } from './perturberPositionConfig.js';
export { vetVerdict } from './vetVerdict.js';
export { runMapPriorEvidence } from './runMapPriorEvidence.js';
export {
  vetFlags, type CandidateVetting, type PerturbedVetting, type VetResult, type VetSettings,
} from './vetFlags.js';
export { runVetToFolder } from './runVetToFolder.js';
export { formatVetCsv, VET_CSV_COLUMNS } from './formatVetCsv.js';
