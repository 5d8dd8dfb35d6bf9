import type { VetThresholds, VetVerdict } from '../records/vetSummary.js';



/** The verdict of ln B = ln Z_perturbed - ln Z_smooth against the thresholds. */
export function vetVerdict(lnBayesFactor: number, thresholds: VetThresholds): VetVerdict {
  if (lnBayesFactor > thresholds.confirmAboveLnB) return 'confirmed';
  if (lnBayesFactor < thresholds.disfavourBelowLnB) return 'disfavoured';
  return 'inconclusive';
}
