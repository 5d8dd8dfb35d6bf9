import type { PixelatedSourceConfig } from '../config/pixelatedSourceConfig.js';

/** A pixelated source bound to the profile vector: its settings and where its sampled parameters sit. */
export interface PixelatedSourceTerm {
  readonly key: string;
  readonly settings: PixelatedSourceConfig;
  /** Offset of log10 of the regularisation strength (and, for the brightness form, of the bright-region strength) in the profile vector. */
  readonly offset: number;
  readonly parameterNames: readonly string[];
}

/** The sampled parameters of a pixelated source of the given regularisation form. */
export function pixelatedParameterNames(settings: PixelatedSourceConfig): string[] {
  return settings.regularisation === 'brightness'
    ? ['log10RegularisationStrength', 'log10BrightRegularisationStrength']
    : ['log10RegularisationStrength'];
}
