import type { LightProfile } from '../../src/light/lightProfile.js';

/** Basis 0 of `profile` at one point (test convenience). */
export function valueAt(profile: LightProfile, p: Float64Array, x: number, y: number): number {
  const out = new Float64Array(1);
  profile.writeBasis(p, 0, Float64Array.of(x), Float64Array.of(y), 1, out, 0, 1);
  return out[0];
}
