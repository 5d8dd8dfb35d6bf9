import type { RunProvenance } from './provenance.js';

/** Where the minimum detectable mass lies relative to the mass prior's range. */
export type DetectableMassLimit = 'within' | 'at-or-below-lower' | 'above-upper';

/** The fraction of grid points where a perturber of 10^log10Mass solar masses is detectable. */
export interface MassDecadeFraction {
  readonly log10Mass: number;
  readonly fraction: number;
  readonly points: number;
}

/** How the smooth model is refitted to a planted image. */
export interface RefitSettings {
  /** Initial simplex step along each free parameter, as a fraction of its prior width (or sigma). */
  readonly stepFraction: number;
  /** Nelder-Mead evaluations allowed per start (there are two starts: the best fit, then a restart). */
  readonly maxEvaluations: number;
  /** Stop when the simplex's chi^2 values span less than this. */
  readonly chiSquareTolerance: number;
}

/** One grid point's answer, as the CSV and JSON hold it. */
export interface SensitivityRecord {
  readonly xArcsec: number;
  readonly yArcsec: number;
  readonly column: number;
  readonly row: number;
  /** +Infinity (null in JSON) when not detectable within the mass prior. */
  readonly log10MinimumMass: number;
  readonly limit: DetectableMassLimit;
  readonly refitEvaluations: number;
}

/** sensitivity.json. */
export interface SensitivitySummary extends RunProvenance {
  readonly kind: 'sensitivity';
  readonly perturber: { readonly key: string; readonly kind: string; readonly log10MassPriorRange: readonly [number, number] };
  readonly bestFit: { readonly from: string; readonly parameters: Record<string, number>; readonly lnLikelihood: number };
  readonly settings: {
    readonly gridSize: number; readonly threshold: number; readonly deltaChiSquareThreshold: number;
    readonly toleranceDex: number; readonly refit: RefitSettings; readonly threads: number;
  };
  readonly approximation: string;
  readonly gridPoints: number;
  readonly decades: readonly MassDecadeFraction[];
  readonly points: readonly (Omit<SensitivityRecord, 'log10MinimumMass'> & { readonly log10MinimumMass: number | null })[];
  readonly files: Record<string, string>;
}
