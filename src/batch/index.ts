// Batch runs: a manifest of lenses run here or as a Slurm job array, resumable, with status and merged results.
export type { BatchRow, BatchRowData } from './batchRow.js';
export type { BatchJob, BatchJobResult } from './batchJob.js';
export { batchJobs } from './batchJobs.js';
export { readBatchManifest, MANIFEST_COLUMNS, BATCH_OWNED_OPTIONS } from './readBatchManifest.js';
export { batchLayout } from './batchLayout.js';
export { readBatchPlan, settleBatchPlan, type BatchPlan } from './batchPlan.js';
export { readRowState, type RowAttempt, type RowStateRecord } from './rowState.js';
export { batchStatus, jobCosts, ROW_STATES, type BatchStatus, type BatchStatusRow, type JobCost, type RowState } from './batchStatus.js';
export { mergeBatchResults, formatResultsCsv, RESULTS_COLUMNS } from './mergeBatchResults.js';
export { runBatchRow, rowFinished, type RowRunOutcome, type RowRunSettings } from './runBatchRow.js';
export { runBatchLocally, type BatchProgress, type LocalBatchSettings } from './runBatchLocally.js';
export { runBatchTask, type BatchTaskSettings } from './runBatchTask.js';
export { slurmJobScript } from './slurmJobScript.js';
export { queuedRows } from './slurmQueue.js';
export { slurmResources, submitBatchToSlurm, type SlurmBatchSettings } from './submitBatchToSlurm.js';
export { readSlurmSubmission, type SlurmResources, type SlurmSubmission } from './slurmSubmission.js';
export { runBatch, type BatchOutcome, type BatchSettings } from './runBatch.js';
export { arcsiftCliPath } from './arcsiftCliPath.js';
