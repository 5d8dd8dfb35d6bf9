import type { CalibrationDetectionRecord } from '../records/calibrationSummary.js';
import type { DetectionClaimKind } from '../results/detectionClaim.js';
import { proportionRecord } from './proportionRecord.js';

/** One comparison on a draw: ln B, whether the draw had a perturber, and its true log10 mass if so. */
export interface DrawDetection {
  readonly lnBayesFactor: number;
  readonly withPerturber: boolean;
  readonly log10Mass: number | null;
  /** The comparison's own claim (ln B above the claim threshold with the misfit alarms; null when not recorded). */
  readonly claim: DetectionClaimKind | null;
  /** The ln B threshold of that claim (null when not recorded). */
  readonly claimThresholdLnB: number | null;
}

/** Edges of the probability bins of the reliability table. */
const PROBABILITY_EDGES = [0, 0.1, 0.3, 0.5, 0.7, 0.9, 1];

/**
 * Detection figures of comparisons on simulated draws: the false-detection rate (ln B above the
 * threshold on draws without a perturber) beside its bound exp(-threshold) (under the smooth
 * model E[B] = 1, so P(B >= k) <= 1/k by Markov's inequality; Royall 2000, JASA 95, 760), the
 * detection rate in bins of true mass (`massBinDex` wide over `massRange`), and the reliability
 * of the posterior probability of a perturber, P = 1 / (1 + exp(-ln B) / odds) with `odds` the
 * ratio of draws with and without a perturber (the mixture's own prior odds), binned against the
 * share of draws in the bin that had one.
 */
export function detectionRates(
  draws: readonly DrawDetection[], thresholdLnB: number, massRange: readonly [number, number] | null, massBinDex: number, massParameter: string | null,
): CalibrationDetectionRecord {
  const nulls = draws.filter((d) => !d.withPerturber);
  const perturbed = draws.filter((d) => d.withPerturber);
  const byMass: CalibrationDetectionRecord['byMass'][number][] = [];
  if (massRange !== null) {
    const [low, high] = massRange;
    const bins = Math.max(1, Math.ceil((high - low) / massBinDex - 1e-9));
    for (let b = 0; b < bins; b++) {
      const lower = low + b * massBinDex;
      const upper = Math.min(high, lower + massBinDex);
      const inBin = perturbed.filter((d) => d.log10Mass !== null && d.log10Mass >= lower && (d.log10Mass < upper || (b === bins - 1 && d.log10Mass <= upper)));
      byMass.push({ log10MassLower: lower, log10MassUpper: upper, ...proportionRecord(inBin.filter((d) => d.lnBayesFactor > thresholdLnB).length, inBin.length) });
    }
  }
  const reliability: CalibrationDetectionRecord['reliability'][number][] = [];
  if (nulls.length > 0 && perturbed.length > 0) {
    const lnOdds = Math.log(perturbed.length / nulls.length);
    const probability = (d: DrawDetection): number => 1 / (1 + Math.exp(-(d.lnBayesFactor + lnOdds)));
    for (let b = 0; b + 1 < PROBABILITY_EDGES.length; b++) {
      const lower = PROBABILITY_EDGES[b];
      const upper = PROBABILITY_EDGES[b + 1];
      const inBin = draws.filter((d) => {
        const p = probability(d);
        return p >= lower && (p < upper || (upper === 1 && p <= 1));
      });
      const mean = inBin.length === 0 ? null : inBin.reduce((s, d) => s + probability(d), 0) / inBin.length;
      reliability.push({ probabilityLower: lower, probabilityUpper: upper, meanProbability: mean, ...proportionRecord(inBin.filter((d) => d.withPerturber).length, inBin.length) });
    }
  }
  return {
    thresholdLnB,
    falseDetection: proportionRecord(nulls.filter((d) => d.lnBayesFactor > thresholdLnB).length, nulls.length),
    falseDetectionBound: Math.exp(-thresholdLnB),
    claims: claimCounts(nulls, perturbed),
    byMass,
    massParameter,
    reliability,
  };
}

/** What the comparisons themselves claimed (their detection rule, not thresholdLnB), on draws without and with a perturber. */
function claimCounts(nulls: readonly DrawDetection[], perturbed: readonly DrawDetection[]): CalibrationDetectionRecord['claims'] {
  const recorded = (draws: readonly DrawDetection[]) => draws.filter((d) => d.claim !== null);
  const count = (draws: readonly DrawDetection[], kind: DetectionClaimKind) => draws.filter((d) => d.claim === kind).length;
  const withoutClaim = recorded(nulls), withClaim = recorded(perturbed);
  const thresholds = [...new Set([...withoutClaim, ...withClaim].map((d) => d.claimThresholdLnB).filter((t): t is number => t !== null))].sort((a, b) => a - b);
  return {
    thresholdsLnB: thresholds,
    falseClaims: proportionRecord(count(withoutClaim, 'detected'), withoutClaim.length),
    trueClaims: proportionRecord(count(withClaim, 'detected'), withClaim.length),
    notEvidenceWithout: count(withoutClaim, 'not-evidence'),
    notEvidenceWith: count(withClaim, 'not-evidence'),
  };
}
