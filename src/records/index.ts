// Run records: the schemas of every file a run writes and a report or a later run reads, with
// the provenance header they share; writers and readers both import them from here.
export type { RunProvenance } from './provenance.js';
export { runProvenance } from './provenance.js';
export { configHash } from './configHash.js';
export { identityChanges, refuseAnotherRun, runIdentity, type DataFileIdentity, type RunIdentity } from './runIdentity.js';
export { qualifiedReading, unfinishedRuns, type RunStop } from './unfinishedRuns.js';
export { packageVersion } from '../io/packageVersion.js';
export type { TruthFile, TruthParameter, TruthPerturber } from './truthFile.js';
export type { SourceFile } from './sourceFile.js';
export { readSourceFile } from './readSourceFile.js';
export { priorCaution, verdictCaution, mapPriorNote, sensitivityApproximation } from './cautions.js';
export type { ModelRecord, RejectionCountsRecord } from './modelRecord.js';
export type { MisfitRecord } from './misfitRecord.js';
export type { EnsembleRecord, EnsembleParameterDiagnostics } from './ensembleRecord.js';
export type { PerturberSummary } from './perturberSummary.js';
export type { ComparisonSummary, ComparisonDetection } from './comparisonSummary.js';
export type { FitSummary, NestedFitSummary, EnsembleFitSummary } from './fitSummary.js';
export type { CountComparisonSummary, CountRow } from './countComparisonSummary.js';
export type { VetSummary, VetRunRecord, VetThresholds, VetVerdict } from './vetSummary.js';
export type { RobustVerdict, RobustVerdictKind, VerdictFamilyRecord, VerdictFitRecord, VerdictSummary } from './verdictSummary.js';
export type {
  SensitivitySummary, SensitivityRecord, MassDecadeFraction, DetectableMassLimit, RefitSettings,
} from './sensitivitySummary.js';
export type {
  CalibrationSummary, CalibrationParameterRecord, CalibrationDetectionRecord, CalibrationDrawRecord, ProportionRecord,
} from './calibrationSummary.js';
export {
  LEADING_COLUMNS, POSTERIOR_FILE_NAMES, POSTERIOR_FORMAT, POSTERIOR_FORMAT_VERSION, POSTERIOR_SIDECAR, POSTERIOR_TABLES, SAMPLER_COLUMNS,
  writePosteriorTables, type PosteriorDraws, type PosteriorSidecar, type PosteriorTableEntry, type PosteriorTableName,
  type PosteriorTablesContent, type WalkerPaths, type WeightedPosteriorRows,
} from './posteriorTables.js';
export { readPosteriorSidecar } from './readPosteriorSidecar.js';
export { readPosteriorTable, type PosteriorTable } from './readPosteriorTable.js';
export { readWeightedPosterior, type WeightedPosteriorColumns } from './readWeightedPosterior.js';
