import type { CosmologyRecord } from '../cosmology/configuredCosmology.js';

/** A fraction of trials with its binomial uncertainty (Wilson 1927 interval at 68.27%). */
export interface ProportionRecord {
  readonly successes: number;
  readonly trials: number;
  readonly fraction: number | null;
  readonly standardError: number | null;
  readonly lower: number;
  readonly upper: number;
}

/** One parameter's simulation-based calibration over the draws whose true model has it. */
export interface CalibrationParameterRecord {
  readonly name: string;
  readonly unit: string;
  readonly draws: number;
  /** L posterior draws per simulation: ranks run over 0..L. */
  readonly rankDraws: number;
  /** Counts of the ranks in equal bins of 0..L. */
  readonly rankHistogram: readonly number[];
  readonly chiSquare: number;
  readonly chiSquarePValue: number;
  /** Kolmogorov-Smirnov test of the posterior CDF at the truth against U(0, 1). */
  readonly ksStatistic: number;
  readonly ksPValue: number;
  /** Share of draws whose truth lies in the reported central 68% and 95% credible intervals. */
  readonly coverage68: ProportionRecord;
  readonly coverage95: ProportionRecord;
  /** Coverage of the central interval of each nominal level, from the posterior CDF at the truth. */
  readonly coverageCurve: readonly ({ readonly level: number } & ProportionRecord)[];
}

/** Detections of the perturber by the Bayes factor, from comparisons on the draws. */
export interface CalibrationDetectionRecord {
  /** Detected when ln B exceeds this. */
  readonly thresholdLnB: number;
  /** Among draws without a perturber. */
  readonly falseDetection: ProportionRecord;
  /** Under the smooth model P(B >= k) <= 1/k, so no more than exp(-threshold) (Royall 2000). */
  readonly falseDetectionBound: number;
  /**
   * What the comparisons claimed by their own rule (ln B above the claim threshold, the smooth
   * model passing the misfit alarm; results/detectionClaim.ts): detections on draws without a
   * perturber (false claims) and with one, and how many gave no evidence at all because the
   * smooth model misfit. Over the draws whose summary records a claim; absent in older files.
   */
  readonly claims?: {
    /** The claim thresholds the comparisons used (one, unless the rows were run with different ones). */
    readonly thresholdsLnB: readonly number[];
    readonly falseClaims: ProportionRecord;
    readonly trueClaims: ProportionRecord;
    readonly notEvidenceWithout: number;
    readonly notEvidenceWith: number;
  };
  /** Among draws with a perturber, by bins of its true log10 mass. */
  readonly byMass: readonly ({ readonly log10MassLower: number; readonly log10MassUpper: number } & ProportionRecord)[];
  readonly massParameter: string | null;
  /**
   * The posterior probability of a perturber that ln B gives at the draws' own prior odds,
   * binned, against the share of those draws that had one: the evidence is calibrated when they agree.
   */
  readonly reliability: readonly ({ readonly probabilityLower: number; readonly probabilityUpper: number; readonly meanProbability: number | null } & ProportionRecord)[];
}

/** One draw's line of the calibration. */
export interface CalibrationDrawRecord {
  readonly id: string;
  readonly withPerturber: boolean;
  readonly state: string;
  readonly lnBayesFactor: number | null;
  readonly truthLog10Mass: number | null;
  /** Why the sampler of the draw's true model stopped ('converged' unless cut short). */
  readonly stopReason: string | null;
  readonly seconds: number;
}

/** calibration.json: written by `arcsift calibrate` when it collects its draws. */
export interface CalibrationSummary {
  readonly kind: 'calibration';
  readonly arcsiftVersion: string;
  readonly config: string;
  readonly configSha256: string;
  readonly title: string;
  readonly job: 'fit' | 'compare';
  readonly seed: number;
  /** The cosmology of every draw's simulation and fit (the config's). */
  readonly cosmology?: CosmologyRecord;
  readonly runOptions: readonly string[];
  readonly rankDraws: number;
  readonly draws: {
    readonly planned: number;
    readonly finished: number;
    readonly withPerturber: number;
    readonly withoutPerturber: number;
    readonly stoppedEarly: number;
    readonly failed: number;
  };
  readonly parameters: readonly CalibrationParameterRecord[];
  readonly detection: CalibrationDetectionRecord | null;
  readonly perDraw: readonly CalibrationDrawRecord[];
  /** Sum of the rows' run times, seconds, and the mean per row. */
  readonly rowSeconds: number;
  readonly meanRowSeconds: number | null;
  readonly assumptions: readonly string[];
}
