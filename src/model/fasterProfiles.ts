import type { LightProfile } from '../light/lightProfile.js';
import { sersic } from '../light/sersic.js';
import { fastSersic } from './fastSersic.js';

/**
 * The profile the forward model evaluates in place of a light profile: the same function with
 * cheaper elementary functions where one exists (fastSersic for sersic), else the profile itself.
 */
export function fasterLightProfile(profile: LightProfile): LightProfile {
  return profile === sersic ? fastSersic : profile;
}
