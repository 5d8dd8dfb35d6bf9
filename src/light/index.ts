export type { LightProfile } from './lightProfile.js';
export { sersic } from './sersic.js';
export {
  sersicCoefficient, sersicCoefficientExact, sersicCoefficientExpansion, SERSIC_EXPANSION_MIN_INDEX,
} from './sersicCoefficient.js';
export { ellipticalGaussian } from './ellipticalGaussian.js';
export { ellipticalQuadraticForm } from './ellipticalQuadraticForm.js';
export { shapelets, shapeletOrders } from './shapelets.js';
export { hermiteFunctions } from './hermiteFunctions.js';
import type { LightProfile } from './lightProfile.js';
import { sersic } from './sersic.js';
import { ellipticalGaussian } from './ellipticalGaussian.js';
import { shapelets } from './shapelets.js';

/** Light profiles with a fixed number of basis functions, by config kind. */
export const lightProfiles: Readonly<Record<'sersic' | 'ellipticalGaussian', LightProfile>> = {
  sersic,
  ellipticalGaussian,
};

const shapeletsByOrder = new Map<number, LightProfile>();

/** The shapelet profile of the given maximum order (one shared instance per order). */
export function shapeletsOfOrder(maxOrder: number): LightProfile {
  let profile = shapeletsByOrder.get(maxOrder);
  if (profile === undefined) {
    profile = shapelets(maxOrder);
    shapeletsByOrder.set(maxOrder, profile);
  }
  return profile;
}
