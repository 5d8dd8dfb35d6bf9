import type { ArcsiftConfig } from '../config/arcsiftConfig.js';

/** The amplitude prior in words, as every summary states it beside its evidences and posteriors. */
export function amplitudePriorText(config: ArcsiftConfig): string {
  return `every linear light amplitude ~ Normal(0, ${config.amplitudePriorSigma}^2), counts/s/arcsec^2 (marginalised analytically)`;
}
