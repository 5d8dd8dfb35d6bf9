import type { ObservationConfig } from '../config/arcsiftConfig.js';

/** A parameter's true value as `arcsift simulate` writes it in truth.json. */
export interface TruthParameter {
  readonly name: string;
  readonly value: number;
  readonly unit: string;
}

/** A simulated perturber's derived masses and sizes (solar masses, kpc, arcsec), as far as its profile defines them. */
export interface TruthPerturber {
  readonly key: string;
  readonly kind?: string;
  readonly massM200Solar?: number;
  readonly totalMassSolar?: number;
  readonly [derived: string]: string | number | undefined;
}

/** truth.json, written by `arcsift simulate` beside the images: what the simulation was made of. */
export interface TruthFile {
  readonly title: string;
  readonly config: string;
  readonly arcsiftVersion: string;
  readonly seed: number;
  readonly noiseless: boolean;
  readonly observation: ObservationConfig;
  readonly cosmology: { readonly name: string; readonly hubbleConstantKmPerSecPerMpc: number };
  readonly redshifts: { readonly lens: number; readonly source: number };
  readonly lensing: {
    readonly lensDistanceMpc: number;
    readonly sourceDistanceMpc: number;
    readonly lensToSourceDistanceMpc: number;
    readonly criticalSurfaceDensitySolarPerMpc2: number;
    readonly criticalSurfaceDensitySolarPerArcsec2: number;
    readonly kpcPerArcsec: number;
  };
  readonly parameters: readonly TruthParameter[];
  readonly amplitudes: readonly TruthParameter[];
  readonly perturbers: readonly TruthPerturber[];
  readonly imageUnit: string;
  readonly files: Readonly<Record<string, string>>;
}
