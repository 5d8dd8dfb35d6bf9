// Surface-brightness profiles: the contract, the profiles, and the table configs name them by.
import { ellipticalGaussian } from './ellipticalGaussian.js';
import { referenceLightOnly, type LightProfilePair } from './lightProfile.js';
import { fastSersic } from './sersic/fastSersic.js';
import { sersic } from './sersic/sersic.js';
import { shapelets } from './shapelets/shapelets.js';
import { fastGaussianRow } from './shapelets/fastGaussianRow.js';

export { referenceLightOnly, type LightProfile, type LightProfilePair } from './lightProfile.js';
export { sersic } from './sersic/sersic.js';
export { fastSersic } from './sersic/fastSersic.js';
export {
  sersicCoefficient, sersicCoefficientExact, sersicCoefficientExpansion, SERSIC_EXPANSION_MIN_INDEX,
} from './sersic/sersicCoefficient.js';
export { ellipticalGaussian } from './ellipticalGaussian.js';
export { ellipticalQuadraticForm } from './ellipticalQuadraticForm.js';
export { shapelets, shapeletOrders } from './shapelets/shapelets.js';
export { hermiteFunctions } from './shapelets/hermiteFunctions.js';

/** Light profiles with a fixed number of basis functions, by config kind: reference and fast evaluation. */
export const lightProfiles: Readonly<Record<'sersic' | 'ellipticalGaussian', LightProfilePair>> = Object.freeze({
  sersic: Object.freeze({ reference: sersic, fast: fastSersic }),
  ellipticalGaussian: referenceLightOnly(ellipticalGaussian),
});

const shapeletsByOrder = new Map<number, LightProfilePair>();

/** The shapelet profile of the given maximum order (one shared instance per order). */
export function shapeletsOfOrder(maxOrder: number): LightProfilePair {
  let pair = shapeletsByOrder.get(maxOrder);
  if (pair === undefined) {
    pair = Object.freeze({ reference: shapelets(maxOrder), fast: shapelets(maxOrder, fastGaussianRow) });
    shapeletsByOrder.set(maxOrder, pair);
  }
  return pair;
}
