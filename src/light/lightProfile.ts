/**
 * The contract every surface-brightness profile meets. The model image is linear in each
 * component's amplitudes, so a profile writes its basis images at unit amplitude and the
 * caller (simulation or the marginalised likelihood) weights them.
 * Positions are arcsec (source plane for source light, image plane for lens light);
 * brightness is image units per arcsec^2.
 */
export interface LightProfile {
  /** Config name, e.g. `sersic`. */
  readonly kind: string;
  /** Nonlinear parameters read from p at offset, in this order (amplitudes excluded). */
  readonly parameterNames: readonly string[];
  /** How many linear amplitudes (basis functions) this component has. */
  readonly basisCount: number;
  /**
   * Writes basis function k at unit amplitude at the n positions into
   * out[outOffset + k * stride + i], for k < basisCount and i < n.
   */
  writeBasis(
    p: Float64Array, offset: number,
    x: Float64Array, y: Float64Array, n: number,
    out: Float64Array, outOffset: number, stride: number,
  ): void;
  /**
   * Optional, for many-basis profiles: the mean of every basis over each of `runs` consecutive
   * runs of `run` positions, into out[outOffset + k * stride + target[t]] for run t. It must equal
   * writeBasis followed by summing each run in order and multiplying by 1 / run, bit for bit, but
   * need not store every position's values.
   */
  writeRunMeans?(
    p: Float64Array, offset: number,
    x: Float64Array, y: Float64Array, runs: number, run: number, target: Int32Array,
    out: Float64Array, outOffset: number, stride: number,
  ): void;
}

/**
 * A light profile as the light table registers it: the reference formula, and the evaluation the
 * forward model runs (the same function with cheaper elementary functions, kept in the profile's
 * folder and tested against the reference there; the reference itself where there is no twin).
 */
export interface LightProfilePair {
  readonly reference: LightProfile;
  readonly fast: LightProfile;
}

/** The pair of a profile with no fast twin. */
export function referenceLightOnly(profile: LightProfile): LightProfilePair {
  return Object.freeze({ reference: profile, fast: profile });
}
