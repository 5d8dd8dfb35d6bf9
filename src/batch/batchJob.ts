import type { BatchRow } from './batchRow.js';

/** What one finished row reports in the status and the merged table. */
export interface BatchJobResult {
  /** ln Z of a nested fit (the smooth model's for a comparison), or null. */
  readonly lnEvidence: number | null;
  readonly lnBayesFactor: number | null;
  readonly lnBayesFactorError: number | null;
  /** A few words: the comparison's reading, the vetting's verdict counts, the sensitivity's best mass. */
  readonly verdict: string;
  /** The job's own figures, for the merged JSON. */
  readonly details: Readonly<Record<string, unknown>>;
}

/**
 * One kind of batch job: which arcsift command runs a row, which file that command writes last
 * (its presence marks the row finished), which manifest columns it needs beyond config and data,
 * the command's arguments for a row, and how to read the result back from that file. The command
 * must take the options every row is given (rowCommand.ts): --config, the data options, --out,
 * --resume (a fresh run when there is no checkpoint), --quiet, --threads and --no-report, and
 * exit with status 2 on a user mistake.
 */
export interface BatchJob {
  readonly command: string;
  readonly describe: string;
  readonly summaryFile: string;
  readonly requires: readonly 'flags'[];
  /** The job's own arguments for a row (the batch adds --config, the data, --out and the run options). */
  readonly arguments: (row: BatchRow) => string[];
  /** The result of a finished row from its parsed summary file. */
  readonly result: (summary: unknown) => BatchJobResult;
}
