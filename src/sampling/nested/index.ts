// Nested sampling on the unit hypercube: the public surface of src/sampling/nested/.
export { runNested } from './runNested.js';
export { autoEllipsoidMaxDim, defaultEnlargement } from './nestedSettings.js';
export { shrinkageSimulations } from './nestedResult.js';
export type {
  NestedProblem,
  NestedOptions,
  NestedResult,
  NestedProgress,
  NestedMethod,
  NestedStopReason,
  NestedCheckpointOptions,
  EvidenceMethod,
} from './nestedProblem.js';
export type { ImportanceOptions, ImportanceSettings } from '../importance/importanceSettings.js';
export { defaultImportanceSettings } from '../importance/importanceSettings.js';
export type { ImportanceResult } from '../importance/importanceResult.js';

export { insertionRankTest, insertionRankThreshold } from './insertionRank.js';
export { mergeEvidenceRuns } from './mergeEvidenceRuns.js';
export type { MergedEvidence } from './mergeEvidenceRuns.js';
export type { InsertionRankCheck } from './insertionRank.js';
export { simulatedLnZSpread } from './evidenceError.js';
export type { ShrinkageRecord } from './evidenceError.js';
export { removeFromCluster, lnVolumeSlice, lnInitialVolume } from './shrinkage.js';
export { boundingEllipsoid, lnUnitBallVolume, sampleInEllipsoid, mahalanobisSquared } from './ellipsoid.js';
export type { Ellipsoid } from './ellipsoid.js';
export { buildEllipsoidUnion, sampleFromUnion } from './multiEllipsoid.js';
export type { EllipsoidUnion, EllipsoidUnionSettings } from './multiEllipsoid.js';
export { sliceChains, type SliceChainsJob, type ChainPoints } from './sliceChains.js';
export { runSliceChain, sliceChainSeeds, type SliceSettings, type UnitBatchEvaluator, type SliceChainRequest, type SliceChainResult } from './sliceChain.js';
export { checkpointFormat, checkpointVersion } from './checkpoint.js';
export { gaussianShellsProblem, gaussianShellsLnEvidence } from './problems/gaussianShells.js';
export { eggBoxProblem, eggBoxLnEvidence } from './problems/eggBox.js';
export { twistedGaussianProblem, twistedGaussianLnEvidence } from './problems/twistedGaussian.js';
