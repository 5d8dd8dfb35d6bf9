import type { ImagePlaneSky } from '../data/imagePlaneSky.js';
import type { PerturberSky } from '../records/perturberSummary.js';
import { parameterSummary } from '../results/index.js';

/**
 * RA and Dec of weighted posterior samples of an image-plane position (x, y in arcsec),
 * summarised each on its own. RA is unwrapped about the image centre's RA before the quantiles,
 * so a posterior straddling RA 0 keeps its shape.
 */
export function perturberSkyPosition(x: Float64Array, y: Float64Array, weights: ArrayLike<number>, sky: ImagePlaneSky): PerturberSky {
  const reference = sky.skyOf(0, 0).raDeg;
  const ra = new Float64Array(x.length);
  const dec = new Float64Array(x.length);
  for (let r = 0; r < x.length; r++) {
    const position = sky.skyOf(x[r], y[r]);
    ra[r] = reference + ((((position.raDeg - reference) % 360) + 540) % 360) - 180;
    dec[r] = position.decDeg;
  }
  return { frame: sky.frame, raDeg: parameterSummary(ra, weights), decDeg: parameterSummary(dec, weights) };
}
