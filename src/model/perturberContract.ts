import type { ComponentConfig } from '../config/arcsiftConfig.js';
import type { MassProfile } from '../lens/massProfile.js';

/** Masses and sizes of one perturber derived from the model vector, for reports and truth files. */
export interface PerturberDerived {
  readonly kind: string;
  readonly massM200Solar?: number;
  readonly totalMassSolar: number;
  readonly concentration?: number;
  readonly r200Kpc?: number;
  readonly scaleRadiusKpc?: number;
  readonly scaleRadiusArcsec?: number;
  readonly truncationRadiusKpc?: number;
  readonly truncationRadiusArcsec?: number;
  /** r_t / r_s of a truncated NFW. */
  readonly truncationRatio?: number;
  readonly convergenceScale?: number;
  /** Tidally truncated perturbers: projected distance from the host centre, and the host's mass in that sphere. */
  readonly hostDistanceArcsec?: number;
  readonly hostMassWithinSolar?: number;
  readonly einsteinRadiusArcsec?: number;
}

/** A perturber of the config bound to model-vector indices. */
export interface PerturberBinding {
  readonly kind: string;
  readonly key: string;
  /** The reference formula, and the evaluation the forward model runs (see MassProfilePair). */
  readonly profile: MassProfile;
  readonly fast: MassProfile;
  /** Model indices of log10 mass, centre x and centre y. */
  readonly massIndex: number;
  readonly centerXIndex: number;
  readonly centerYIndex: number;
  /** Fills this perturber's lensing parameters in the profile vector (allocates nothing). */
  readonly write: (model: Float64Array, profile: Float64Array) => void;
  derived(model: Float64Array): PerturberDerived;
  /** The joint region prior on the centre, when the config gives one. */
  readonly positionPrior?: ComponentConfig['positionPrior'];
}
