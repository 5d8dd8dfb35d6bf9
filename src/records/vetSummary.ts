import type { PriorDescription } from '../priors/parameterSpace.js';
import type { ParameterSummary } from '../results/parameterSummary.js';
import type { ModelRecord } from './modelRecord.js';
import type { PerturberSky } from './perturberSummary.js';
import type { RunProvenance } from './provenance.js';

/**
 * What a vetted flag's Bayes factor says; `not-evidence` when the shared smooth fit fails the
 * misfit alarm, so that no ln B of the vetting is evidence of a subhalo.
 */
export type VetVerdict = 'confirmed' | 'inconclusive' | 'disfavoured' | 'not-evidence';

/** The ln B thresholds of the verdicts. */
export interface VetThresholds {
  /** Confirmed when ln B > this: the detection threshold (default runDefaults.detection, ln B = 50). */
  readonly confirmAboveLnB: number;
  /** Disfavoured when ln B < this (default -1, "positive" evidence for the smooth model: 2 ln B < -2). */
  readonly disfavourBelowLnB: number;
}

/** What vet.json says of one perturbed run. */
export interface VetRunRecord {
  readonly id: string;
  /** Where the flag came from (file and line, or map pixel); the map file for the map-prior run. */
  readonly origin: string;
  /** The flag's position; RA and Dec (degrees) too when the image has a celestial WCS. */
  readonly flag: { readonly xArcsec: number; readonly yArcsec: number; readonly raDeg?: number; readonly decDeg?: number } | null;
  readonly score: number | null;
  /** The position prior: the window around the flag, or the map. */
  readonly positionPrior: string;
  readonly lnBayesFactor: number;
  readonly lnBayesFactorError: number;
  readonly verdict: VetVerdict;
  /** Kass & Raftery 1995 reading of ln B. */
  /** The Kass & Raftery reading of ln B, saying first when its runs were cut short. */
  readonly reading: string;
  /** False when this run or the smooth one was cut short: ln B and the verdict are not final. */
  readonly finished: boolean;
  /** log10 of the sampled mass (M200 for NFW-type perturbers, total mass otherwise), median and intervals. */
  readonly log10Mass: ParameterSummary;
  readonly log10MassUpperLimit95: number;
  readonly massPriorRange: readonly [number, number] | null;
  readonly position: { readonly xArcsec: ParameterSummary; readonly yArcsec: ParameterSummary; readonly sky?: PerturberSky };
  /** Distance of the posterior median position from the flag, arcsec (null for the map-prior run). */
  readonly offsetArcsec: number | null;
  readonly model: ModelRecord;
}

/** vet.json: written last, only for a finished vetting. */
export interface VetSummary extends RunProvenance {
  readonly kind: 'vet';
  readonly flags: {
    readonly file: string;
    readonly kind: 'list' | 'map';
    readonly mapThreshold: number | null;
    readonly mergeRadiusArcsec: number | null;
    readonly notices: readonly string[];
  };
  readonly settings: Record<string, unknown>;
  readonly thresholds: VetThresholds;
  /** Where the confirmation threshold comes from (results/detectionClaim.ts). */
  readonly thresholdSource: string;
  /** Why no ln B is evidence when the shared smooth fit fails the misfit alarm; null when it passes (or no fit was run). */
  readonly smoothMisfitNote: string | null;
  readonly windowArcsec: number;
  readonly perturberKind: string;
  /** Null when there was no candidate to vet (a map with no value at the threshold): no fit was run. */
  readonly smooth: ModelRecord | null;
  readonly candidates: readonly VetRunRecord[];
  readonly mapPrior: VetRunRecord | null;
  readonly priors: {
    readonly smooth: readonly PriorDescription[];
    /** The perturbed models' priors without the perturber's centre, which `positionPrior` describes. */
    readonly perturbed: readonly PriorDescription[];
    readonly positionPrior: string;
  };
  readonly amplitudePrior: string;
  readonly caution: string;
  readonly mapPriorNote: string | null;
}
