import type { ParameterSummary } from '../results/parameterSummary.js';

/** Posterior summary of one perturber: mass, position and derived masses. */
export interface PerturberSummary {
  readonly key: string;
  readonly kind: string;
  /** log10 of the sampled mass (M200 for NFW-type perturbers, total mass otherwise). */
  readonly log10Mass: ParameterSummary;
  readonly log10MassUpperLimit95: number;
  readonly centerXArcsec: ParameterSummary;
  readonly centerYArcsec: ParameterSummary;
  /** log10 of M200 and of the total (truncated) mass, where the profile defines them. */
  readonly log10M200: ParameterSummary | null;
  readonly log10TotalMass: ParameterSummary | null;
  readonly massPriorRange: readonly [number, number] | null;
}
