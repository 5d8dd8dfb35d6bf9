import { standardNormalQuantile } from '../special/standardNormal.js';

/** A binomial proportion with its interval. */
export interface ProportionInterval {
  readonly successes: number;
  readonly trials: number;
  /** successes / trials (NaN without trials). */
  readonly fraction: number;
  /** sqrt(p (1 - p) / n), the binomial standard error of the fraction (NaN without trials). */
  readonly standardError: number;
  readonly lower: number;
  readonly upper: number;
}

// Score interval of a binomial proportion at confidence `level`: (p + z^2/2n -+ z sqrt(p(1-p)/n +
// z^2/4n^2)) / (1 + z^2/n) (Wilson 1927, JASA 22, 209); unlike p -+ z se it stays inside [0, 1]
// and is not empty at 0 or n successes.
export function wilsonInterval(successes: number, trials: number, level = 0.6827): ProportionInterval {
  if (trials === 0) return { successes, trials, fraction: NaN, standardError: NaN, lower: 0, upper: 1 };
  const p = successes / trials;
  const z = standardNormalQuantile(0.5 + level / 2);
  const z2n = (z * z) / trials;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z * Math.sqrt((p * (1 - p)) / trials + z2n / (4 * trials))) / (1 + z2n);
  return { successes, trials, fraction: p, standardError: Math.sqrt((p * (1 - p)) / trials), lower: Math.max(0, centre - half), upper: Math.min(1, centre + half) };
}
