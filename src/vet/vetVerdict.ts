import type { VetThresholds, VetVerdict } from '../records/vetSummary.js';
import { runDefaults } from '../settings/runDefaults.js';

/** The default thresholds: confirmed above the detection threshold (runDefaults.detection), disfavoured below runDefaults.vet. */
export function defaultVetThresholds(): VetThresholds {
  return { confirmAboveLnB: runDefaults.detection.lnBayesFactorThreshold, disfavourBelowLnB: runDefaults.vet.disfavourBelowLnB };
}

/**
 * The verdict of ln B = ln Z_perturbed - ln Z_smooth against the thresholds. When the shared
 * smooth fit's misfit alarm sounds (`smoothMisfit`), no ln B is evidence of a subhalo (the
 * perturber may stand in for what the smooth model lacks), so every candidate is `not-evidence`
 * (the rule of results/detectionClaim.ts, applied to each flag).
 */
export function vetVerdict(lnBayesFactor: number, thresholds: VetThresholds, smoothMisfit = false): VetVerdict {
  if (smoothMisfit) return 'not-evidence';
  if (lnBayesFactor > thresholds.confirmAboveLnB) return 'confirmed';
  if (lnBayesFactor < thresholds.disfavourBelowLnB) return 'disfavoured';
  return 'inconclusive';
}
