/** What a vetted flag's Bayes factor says. */
export type VetVerdict = 'confirmed' | 'inconclusive' | 'disfavoured';

/** The ln B thresholds of the verdicts. */
export interface VetThresholds {
  /** Confirmed when ln B > this (default 3, "strong" on the Kass & Raftery 1995 scale: 2 ln B > 6). */
  readonly confirmAboveLnB: number;
  /** Disfavoured when ln B < this (default -1, "positive" evidence for the smooth model: 2 ln B < -2). */
  readonly disfavourBelowLnB: number;
}

export const defaultVetThresholds: VetThresholds = { confirmAboveLnB: 3, disfavourBelowLnB: -1 };

/** The verdict of ln B = ln Z_perturbed - ln Z_smooth against the thresholds. */
export function vetVerdict(lnBayesFactor: number, thresholds: VetThresholds): VetVerdict {
  if (lnBayesFactor > thresholds.confirmAboveLnB) return 'confirmed';
  if (lnBayesFactor < thresholds.disfavourBelowLnB) return 'disfavoured';
  return 'inconclusive';
}
