import { gammaincinv } from '../../numeric/special/stdlibSpecial.js';

/**
 * Below this Sersic index the asymptotic expansion is not used. The 0.36 threshold is that of
 * MacArthur, Courteau & Holtzman 2003 (ApJ 582, 689), who fit b_n by a polynomial below it (as
 * transcribed by others; the paper was not reachable here); it is not Ciotti & Bertin's. At
 * n = 0.3 the expansion's relative error is already 2e-3 (1e-1 at n = 0.2, and it turns
 * negative near n = 0.1), so below the threshold the exact root is solved instead.
 */
export const SERSIC_EXPANSION_MIN_INDEX = 0.36;

/**
 * Ciotti & Bertin 1999 (A&A 352, 447; astro-ph/9911078), eq. 18: asymptotic expansion of b_n in
 * powers of 1/n (coefficients from memory of the paper; checked instead against the exact root of
 * gamma(2n, b) = Gamma(2n) / 2, computed to 80 digits). Relative error against that root, bounded in
 * test/light/sersic/sersicCoefficient.test.ts: 3.6e-4 at n = 0.5, 2.5e-5 at n = 1, 1.3e-6 at
 * n = 2, 7.1e-8 at n = 4, 4.2e-9 at n = 8.
 * The error falls as n^-3, not n^-5: the n^-3 coefficient here, 131/1148175 = 1.14e-4, is not
 * the exact root's, 281/3444525 = 8.16e-5 (the gamma-median series, Choi 1994 / Temme 1992
 * eq. 6.2 as transcribed, with a = 2n; confirmed against an 80-digit root). Kept in the
 * published form (the exact root is one call away: sersicCoefficientExact).
 */
export function sersicCoefficientExpansion(sersicIndex: number): number {
  const u = 1 / sersicIndex;
  return 2 * sersicIndex - 1 / 3
    + u * (4 / 405 + u * (46 / 25515 + u * (131 / 1148175 - u * (2194697 / 30690717750))));
}

/**
 * The defining condition of b_n (Ciotti 1991; Graham & Driver 2005, eq. 4): half the total
 * light lies inside R_e, P(2n, b_n) = 1/2 with P the regularised lower incomplete gamma
 * function, solved by the inverse incomplete gamma function of @stdlib/math.
 */
export function sersicCoefficientExact(sersicIndex: number): number {
  return gammaincinv(0.5, 2 * sersicIndex);
}

/** b_n of the Sersic law: eq. 18 of Ciotti & Bertin (1999) for n >= 0.36, the exact root below. */
export function sersicCoefficient(sersicIndex: number): number {
  if (sersicIndex >= SERSIC_EXPANSION_MIN_INDEX) return sersicCoefficientExpansion(sersicIndex);
  // The exact root costs a few microseconds; a fit calls this with the same index many times.
  if (sersicIndex !== cachedIndex) {
    cachedIndex = sersicIndex;
    cachedCoefficient = sersicCoefficientExact(sersicIndex);
  }
  return cachedCoefficient;
}

let cachedIndex = Number.NaN;
let cachedCoefficient = Number.NaN;
