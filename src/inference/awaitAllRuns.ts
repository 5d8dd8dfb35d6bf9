import { RunInterrupted } from '../errors.js';

/**
 * Waits for every run of a set that goes side by side, so that each stopped one has written its
 * last checkpoint, and then returns their results in order. When some failed: the first failure
 * that is not a stop request, else one RunInterrupted naming every run's checkpoints.
 */
export async function awaitAllRuns<T>(runs: readonly Promise<T>[]): Promise<T[]> {
  const settled = await Promise.allSettled(runs);
  const failures = settled.flatMap((s) => (s.status === 'rejected' ? [s.reason as unknown] : []));
  if (failures.length === 0) return settled.map((s) => (s as PromiseFulfilledResult<T>).value);
  const fault = failures.find((f) => !(f instanceof RunInterrupted));
  if (fault !== undefined) throw fault;
  throw new RunInterrupted((failures as RunInterrupted[]).flatMap((f) => f.checkpoints));
}
