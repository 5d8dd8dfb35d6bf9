/**
 * Counts kept on the likelihood's side of a run (why evaluations were rejected, by reason), which
 * a sampler stores in its checkpoints without knowing what they mean, so that a resumed run
 * reports the counts of its whole history.
 */
export interface RunTallies {
  /** The counts so far, from the run's start (a resumed run's earlier part included). */
  read(): Record<string, number>;
  /** Continues from counts read back from a checkpoint; called before any evaluation. */
  restore(saved: Readonly<Record<string, number>>): void;
}
