import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { defaultCosmology, flatLambdaCdm, lensingContext, type LensingContext } from '../cosmology/index.js';

/** The lensing context (distances, Sigma_crit) of a config's redshifts and cosmology. */
export function buildLensingContext(config: ArcsiftConfig): LensingContext {
  const cosmology = config.cosmology === undefined
    ? defaultCosmology
    : flatLambdaCdm({ ...config.cosmology, name: `flat LambdaCDM from ${config.file}` });
  return lensingContext(cosmology, config.lensRedshift, config.sourceRedshift);
}
