import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { configuredCosmology, lensingContext, type LensingContext } from '../cosmology/index.js';

/** The lensing context (distances, Sigma_crit) of a config's redshifts and cosmology. */
export function buildLensingContext(config: ArcsiftConfig): LensingContext {
  return lensingContext(configuredCosmology(config).model, config.lensRedshift, config.sourceRedshift);
}
