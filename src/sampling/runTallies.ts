import { InputError, expectedFound } from '../errors.js';

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

/** Tallies read back from a checkpoint file: an object of whole counts, or an error naming the file and key. */
export function checkpointTallies(value: unknown, path: string): Record<string, number> {
  const entries = typeof value === 'object' && value !== null && !Array.isArray(value) ? Object.entries(value) : null;
  if (entries === null || entries.some(([, count]) => typeof count !== 'number' || !Number.isInteger(count) || count < 0)) {
    throw new InputError(expectedFound('an object of whole counts', value), { file: path, key: 'tallies' });
  }
  return Object.fromEntries(entries) as Record<string, number>;
}
