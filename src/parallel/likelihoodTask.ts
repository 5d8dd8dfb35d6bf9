import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';

/**
 * What a likelihood worker needs to build its own PixelLikelihood: the validated config (plain
 * data), the observed data (its pixel arrays live on SharedArrayBuffers, so posting them shares
 * rather than copies), and how many of the config's perturbers the model includes.
 */
export interface LikelihoodTask {
  readonly config: ArcsiftConfig;
  readonly data: ObservedData;
  readonly perturberCount: number;
}
