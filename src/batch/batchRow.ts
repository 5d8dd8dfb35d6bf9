/** The observed data of a row: a folder as `simulate` writes it, and/or explicit files (absolute paths). */
export interface BatchRowData {
  readonly folder?: string;
  readonly image?: string;
  readonly noise?: string;
  readonly psf?: string;
  readonly mask?: string;
}

/**
 * One row of a batch manifest, checked and with absolute paths: one lens (its data and config)
 * and the job to run on it. `options` are extra arguments of the job's command for this row.
 */
export interface BatchRow {
  /** Unique in the batch; names the row's run folder. */
  readonly id: string;
  /** A key of `batchJobs`. */
  readonly job: string;
  readonly config: string;
  readonly data: BatchRowData;
  /** Flag list or probability map (the vet job's --flags). */
  readonly flags?: string;
  /** The sampler seed of this row (--seed), when not the command's default. */
  readonly seed?: number;
  readonly options: readonly string[];
  /** Where the row was written, for messages: `FILE line N` or `FILE rows[K]`. */
  readonly origin: string;
}
