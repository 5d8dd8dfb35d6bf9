/**
 * The contract every lensing mass profile meets. Parameters travel as a flat Float64Array
 * `p` read from index `offset` in the order of `parameterNames`, so the hot path allocates
 * nothing. Positions are image-plane arcsec in arcsift's convention (see README); deflections
 * are arcsec, convergence is dimensionless, the potential is arcsec^2.
 * Every method ADDS its contribution to the output arrays (so components superpose).
 */
export interface MassProfile {
  /** Config name of the profile, e.g. `isothermalEllipsoid`. */
  readonly kind: string;
  /** Names (with units in the name where needed) of the entries of p this profile reads. */
  readonly parameterNames: readonly string[];
  addDeflection(
    p: Float64Array, offset: number,
    x: Float64Array, y: Float64Array, n: number,
    alphaX: Float64Array, alphaY: Float64Array,
  ): void;
  addConvergence(
    p: Float64Array, offset: number,
    x: Float64Array, y: Float64Array, n: number,
    kappa: Float64Array,
  ): void;
  /**
   * Mass inside a sphere of radius r (arcsec) about the profile's centre, of the spherical body
   * whose projection is this convergence read by its circularised radius, in units of
   * Sigma_crit arcsec^2 (times Sigma_crit per arcsec^2 it is in solar masses). Present for the
   * main-lens profiles that describe a body (not for shear or multipoles); the tidal radius of a
   * subhalo reads it.
   */
  sphericalMassWithin?(p: Float64Array, offset: number, radiusArcsec: number): number;
  /** Present only where the potential is analytic. */
  addPotential?(
    p: Float64Array, offset: number,
    x: Float64Array, y: Float64Array, n: number,
    psi: Float64Array,
  ): void;
}

/**
 * A mass profile as the profile tables register it: the reference formula, and the evaluation
 * the forward model runs (the same function with cheaper elementary functions, kept in the
 * profile's folder and tested against the reference there; the reference itself where there is
 * no such twin).
 */
export interface MassProfilePair {
  readonly reference: MassProfile;
  readonly fast: MassProfile;
}

/** The pair of a profile with no fast twin. */
export function referenceOnly(profile: MassProfile): MassProfilePair {
  return Object.freeze({ reference: profile, fast: profile });
}
