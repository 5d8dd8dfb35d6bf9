import { logAddExp } from '../numeric/statistics/logSumExp.js';

/** How a nested-sampling run built up its evidence, point by point in the order of the run. */
export interface EvidenceTrace {
  /** ln of the evidence accumulated up to and including each point. */
  readonly accumulatedLnZ: Float64Array;
  /** ln of the prior volume still enclosed after each point (-Infinity after the last). */
  readonly lnX: Float64Array;
}

/**
 * Rebuilds the run's evidence history from its normalised posterior weights (Skilling 2006:
 * w_i = L_i dX_i / Z, so Z accumulated to point i is Z * sum_{j <= i} w_j, and the volume dX_i
 * of each point is w_i Z / L_i; the volume enclosed after point i is the sum of the later dX).
 * Points must be in the run's order: dead points, then the final live points.
 */
export function evidenceTrace(lnWeight: ArrayLike<number>, lnLikelihood: ArrayLike<number>, lnEvidence: number): EvidenceTrace {
  const count = lnWeight.length;
  const accumulatedLnZ = new Float64Array(count);
  const lnX = new Float64Array(count);
  let running = -Infinity;
  for (let i = 0; i < count; i++) {
    running = logAddExp(running, lnWeight[i]);
    accumulatedLnZ[i] = lnEvidence + running;
  }
  let later = -Infinity;
  for (let i = count - 1; i >= 0; i--) {
    lnX[i] = later;
    const lnVolume = lnWeight[i] + lnEvidence - lnLikelihood[i];
    if (Number.isFinite(lnVolume)) later = logAddExp(later, lnVolume);
  }
  return { accumulatedLnZ, lnX };
}
