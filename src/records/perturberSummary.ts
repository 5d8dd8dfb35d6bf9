import type { ParameterSummary } from '../results/parameterSummary.js';

/** Posterior summary of one perturber: mass, position and derived masses. */
export interface PerturberSummary {
  readonly key: string;
  readonly kind: string;
  /** log10 of the sampled mass (M200 for NFW-type perturbers, total mass otherwise). */
  readonly log10Mass: ParameterSummary;
  readonly log10MassUpperLimit95: number;
  readonly centerXArcsec: ParameterSummary;
  readonly centerYArcsec: ParameterSummary;
  /** log10 of M200 and of the total (truncated) mass, where the profile defines them. */
  readonly log10M200: ParameterSummary | null;
  readonly log10TotalMass: ParameterSummary | null;
  readonly massPriorRange: readonly [number, number] | null;
  /** The position on the sky, when the image has a celestial WCS. */
  readonly sky?: PerturberSky;
}

/**
 * A posterior position on the sky: RA and Dec in degrees in the image's frame, each summarised
 * over the samples (so the medians are those of RA and of Dec, not the sky of the median x, y).
 * RA is unwrapped about the image centre's RA, so near RA 0 an interval may run below 0 or above 360.
 */
export interface PerturberSky {
  /** RADESYS of the image's WCS, e.g. ICRS. */
  readonly frame: string;
  readonly raDeg: ParameterSummary;
  readonly decDeg: ParameterSummary;
}
