import type { LightProfile } from '../light/lightProfile.js';
import type { MassProfile } from '../lens/massProfile.js';
import { sersic } from '../light/sersic.js';
import { isothermalEllipsoid } from '../lens/isothermalEllipsoid.js';
import { fastSersic } from './fastSersic.js';
import { fastIsothermalEllipsoid } from './fastIsothermalEllipsoid.js';
import { truncatedNfw } from '../perturber/truncatedNfw.js';
import { fastTruncatedNfw } from './fastTruncatedNfw.js';


/**
 * The profile the forward model evaluates in place of a light profile: the same function with
 * cheaper elementary functions where one exists (fastSersic for sersic), else the profile itself.
 */
export function fasterLightProfile(profile: LightProfile): LightProfile {
  return profile === sersic ? fastSersic : profile;
}

/**
 * As fasterLightProfile for mass profiles (fastIsothermalEllipsoid for isothermalEllipsoid,
 * fastTruncatedNfw for truncatedNfw).
 */
export function fasterMassProfile(profile: MassProfile): MassProfile {
  if (profile === isothermalEllipsoid) return fastIsothermalEllipsoid;
  return profile === truncatedNfw ? fastTruncatedNfw : profile;
}
