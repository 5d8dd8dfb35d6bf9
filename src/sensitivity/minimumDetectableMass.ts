import type { DetectableMassLimit } from '../records/sensitivitySummary.js';

export interface MinimumDetectableMass {
  /** log10 of the smallest detectable mass (midpoint of the last bracket); the lower end when even it is detected; +Infinity when not even the upper end is. */
  readonly log10Mass: number;
  readonly limit: DetectableMassLimit;
  /** Delta chi^2 at the evaluated masses, in the order evaluated. */
  readonly trials: readonly { readonly log10Mass: number; readonly deltaChiSquare: number }[];
  readonly evaluations: number;
}

export interface DetectableMassSearch {
  /** log10 mass range searched (the perturber's mass prior). */
  readonly lower: number;
  readonly upper: number;
  /** Detected when Delta chi^2 / 2 >= this (runDefaults.sensitivity.threshold by default). */
  readonly threshold: number;
  /** Stop when the bracket is narrower than this, dex. */
  readonly toleranceDex: number;
}


/**
 * The smallest log10 mass at which Delta chi^2 / 2 reaches the threshold, by bisection in log10
 * mass over [lower, upper] (assuming the statistic grows with mass): the upper end is tried
 * first (not detectable there: +Infinity), then the lower end (detectable there: the lower end),
 * then the bracket is halved until narrower than toleranceDex.
 */
export function minimumDetectableMass(
  statistic: (log10Mass: number) => { deltaChiSquare: number; evaluations: number }, search: DetectableMassSearch,
): MinimumDetectableMass {
  const trials: { log10Mass: number; deltaChiSquare: number }[] = [];
  let evaluations = 0;
  const detected = (log10Mass: number): boolean => {
    const r = statistic(log10Mass);
    evaluations += r.evaluations;
    trials.push({ log10Mass, deltaChiSquare: r.deltaChiSquare });
    return r.deltaChiSquare / 2 >= search.threshold;
  };
  if (!detected(search.upper)) return { log10Mass: Number.POSITIVE_INFINITY, limit: 'above-upper', trials, evaluations };
  if (detected(search.lower)) return { log10Mass: search.lower, limit: 'at-or-below-lower', trials, evaluations };
  let low = search.lower;
  let high = search.upper;
  while (high - low > search.toleranceDex) {
    const mid = 0.5 * (low + high);
    if (detected(mid)) high = mid;
    else low = mid;
  }
  return { log10Mass: 0.5 * (low + high), limit: 'within', trials, evaluations };
}
