/** One sampler run of a record and why it stopped ('converged' when it finished). */
export interface RunStop {
  readonly label: string;
  readonly stopReason: string;
}

/** The runs a limit cut short, as `label (why)`; empty when every run finished. */
export function unfinishedRuns(runs: readonly RunStop[]): string[] {
  return runs.filter((r) => r.stopReason !== 'converged').map((r) => `${r.label} (${r.stopReason})`);
}

/**
 * A Bayes-factor reading as records and terminals show it: when any of the runs behind it was
 * cut short, it says so first, since its ln Z are not final.
 */
export function qualifiedReading(sentence: string, unfinished: readonly string[]): string {
  if (unfinished.length === 0) return sentence;
  return `NOT FINAL, from runs cut short before converging (${unfinished.join(', ')}): ${sentence}`;
}
