import type { PerturberSky } from '../records/perturberSummary.js';

/** Degrees to 1e-6 (0.0036 arcsec), finer than any posterior of a perturber's position. */
const degrees = (v: number): string => (Number.isFinite(v) ? v.toFixed(6) : String(v));

/** A perturber's posterior RA and Dec for the terminal: medians with their 68% intervals, in degrees. */
export function formatSky(sky: PerturberSky): string {
  const part = (name: string, s: PerturberSky['raDeg']): string =>
    `${name} ${degrees(s.median)} (68% ${degrees(s.interval68.lower)} to ${degrees(s.interval68.upper)})`;
  return `${part('RA', sky.raDeg)}, ${part('Dec', sky.decDeg)} degrees (${sky.frame})`;
}
