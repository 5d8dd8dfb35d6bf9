import type { MisfitRecord } from './misfitRecord.js';

/**
 * Likelihood calls a pixelated source answered with minus infinity, by reason: the mesh could not
 * be built, the posterior precision was not positive definite, the regularisation matrix was not
 * (src/inversion/inversionRejections.ts). Counted over every call of the run, resumed parts
 * included. Beside them, not a rejection: `triangleFallbacks`, the rays an adaptive mesh weighed
 * by their holding triangle because their natural-neighbour ring was degenerate (absent from
 * records written before it was counted).
 */
export interface RejectionCountsRecord {
  readonly mesh: number;
  readonly notPositiveDefinite: number;
  readonly regularisation: number;
  readonly triangleFallbacks?: number;
}

/** What a summary says of one model's run. */
export interface ModelRecord {
  readonly label: string;
  readonly lnEvidence: number;
  readonly lnEvidenceError: number;
  readonly lnEvidenceErrorSimulated: number;
  readonly informationNats: number;
  readonly livePoints: number;
  readonly method: string;
  readonly iterations: number;
  readonly evaluations: number;
  readonly efficiency: number;
  readonly nonFiniteLikelihoods: number;
  /** With a pixelated source: its likelihoods of minus infinity by reason (absent otherwise, and in older records). */
  readonly likelihoodRejections?: RejectionCountsRecord;
  readonly insertionRankPValue: number;
  readonly insertionRankWarning: boolean;
  /**
   * Where lnEvidence came from and how far to trust it (absent in records written before the
   * importance stage existed: those are 'nested').
   */
  readonly evidence?: EvidenceRecord;
  readonly stopReason: string;
  readonly bestLnLikelihood: number;
  readonly bestFit: Record<string, number>;
  readonly bestFitAmplitudes: Record<string, number>;
  /** The misfit alarm at the best fit (chi-square per degree of freedom, Moran's I of the normalised residuals). */
  readonly misfit: MisfitRecord;
  readonly seconds: number;
  readonly threads: number;
  readonly parameters: readonly {
    name: string; unit: string; median: number;
    interval68: readonly [number, number]; interval95: readonly [number, number];
    /** For a position angle (counter-clockwise from +x) of an image with a celestial WCS: the same east of north. */
    eastOfNorthDeg?: { median: number; interval68: readonly [number, number]; interval95: readonly [number, number] };
  }[];
  readonly files: Record<string, string>;
}

/** How a run's ln Z was estimated (sampling/importance/importanceResult.ts for the fields' meaning). */
export interface EvidenceRecord {
  /** 'nested' (the nested-sampling sum) or 'importance' (importance sampling after the nested run). */
  readonly method: 'nested' | 'importance';
  /** the nested-sampling sum and its error, whichever method gave lnEvidence. */
  readonly nestedLnEvidence: number;
  readonly nestedLnEvidenceError: number;
  /** the importance stage's diagnostics (null with method 'nested'). */
  readonly importance: {
    readonly evaluations: number;
    readonly finalDraws: number;
    readonly effectiveSampleSize: number;
    readonly largestWeightShare: number;
    readonly paretoShape: number;
    readonly paretoShapeLimit: number;
    readonly proposalComponents: number;
    readonly stages: number;
    readonly repeatZ: number;
    readonly nestedZ: number;
    readonly suspect: boolean;
    readonly nestedDisagrees: boolean;
  } | null;
}
