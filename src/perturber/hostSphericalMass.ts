import type { LensingContext } from '../cosmology/lensingContext.js';
import type { MassProfile } from '../lens/massProfile.js';

/** A main-lens component in a profile vector: its profile and where its parameters start. */
export interface HostComponent {
  readonly profile: MassProfile;
  readonly offset: number;
}

/**
 * Mass of the host (the main lens) inside a sphere of radius r about each component's centre, in
 * solar masses: the sum of the components' sphericalMassWithin (Sigma_crit arcsec^2) times
 * Sigma_crit per arcsec^2. Each component is read as the spherical body whose projection is its
 * circularised convergence (see MassProfile.sphericalMassWithin); the caller checks that every
 * component has the method.
 */
export function hostSphericalMassSolar(
  components: readonly HostComponent[], p: Float64Array, radiusArcsec: number, context: LensingContext,
): number {
  let mass = 0;
  for (let k = 0; k < components.length; k++) {
    const { profile, offset } = components[k];
    mass += profile.sphericalMassWithin!(p, offset, radiusArcsec);
  }
  return mass * context.criticalSurfaceDensitySolarPerArcsec2;
}
