/**
 * The dimensionless functions of the projected NFW profile, x = R / r_s, written so that each
 * keeps full double precision through x = 1 (where the closed forms are 0/0) and as x -> 0:
 *   F(x) = arccosh(1/x) / sqrt(1 - x^2)   (x < 1),   arccos(1/x) / sqrt(x^2 - 1)   (x > 1),   F(1) = 1,
 *   C(x) = (1 - F(x)) / (x^2 - 1)                     (convergence shape, kappa = 2 kappa_s C),
 *   h(x) = ln(x/2) + F(x)                             (projected mass, M_2D = 4 pi rho_s r_s^3 h).
 * Near x = 1 they use the series in w = x^2 - 1 of atanh(s)/s and atan(t)/t (s^2 = -w, t^2 = w):
 *   C = sum_k (-w)^k / (2k + 3),  F = 1 - w C.
 */

/** |x^2 - 1| below which the series replaces the closed forms. */
const seriesHalfWidth = 0.02;
/** Terms of the series kept: the first dropped one is below 0.02^11 / 25 < 1e-20. */
const seriesTerms = 11;

// Sum_k (-w)^k / (2k + 3), k < seriesTerms, the Taylor series of (1 - F)/(x^2 - 1) about x = 1
// (from atanh(s)/s = sum s^2k/(2k+1) and atan(t)/t = sum (-t^2)^k/(2k+1), Abramowitz & Stegun 4.4.42, 4.6.33).
function convergenceShapeSeries(w: number): number {
  let sum = 1 / (2 * seriesTerms + 1);
  for (let k = seriesTerms - 2; k >= 0; k--) sum = 1 / (2 * k + 3) - w * sum;
  return sum;
}

// F(x) of the projected NFW profile (Bartelmann 1996, A&A 313, 697; Wright & Brainerd 2000, ApJ 534, 34),
// as ln((1 + s)/x)/s, s = sqrt(1 - x^2), below 1 and atan(t)/t, t = sqrt(x^2 - 1), above.
export function nfwProjectionF(x: number): number {
  const w = (x - 1) * (x + 1);
  if (w < -seriesHalfWidth) {
    const s = Math.sqrt(-w);
    return Math.log((1 + s) / x) / s;
  }
  if (w > seriesHalfWidth) {
    const t = Math.sqrt(w);
    return Math.atan(t) / t;
  }
  return 1 - w * convergenceShapeSeries(w);
}

// Convergence shape (1 - F(x))/(x^2 - 1): kappa_NFW = 2 kappa_s (1 - F)/(x^2 - 1)
// (Bartelmann 1996; Wright & Brainerd 2000, eq. 11 in units of Sigma_crit).
export function nfwConvergenceShape(x: number): number {
  const w = (x - 1) * (x + 1);
  if (w < -seriesHalfWidth || w > seriesHalfWidth) return (1 - nfwProjectionF(x)) / w;
  return convergenceShapeSeries(w);
}

// Projected-mass shape h(x) = ln(x/2) + F(x): M_2D(<R) = 4 pi rho_s r_s^3 h(x) (Bartelmann 1996;
// Golse & Kneib 2002, A&A 390, 821). Below x = 1/2 it is evaluated as
// [x^2 ln(2/x)/(1+s) + log1p(-x^2/(2(1+s)))]/s, s = sqrt(1 - x^2), an identity free of the
// cancellation between ln(x/2) and F(x) that the plain form suffers as x -> 0.
export function nfwProjectedMassShape(x: number): number {
  if (x < 0.5) {
    const s = Math.sqrt((1 - x) * (1 + x));
    const x2 = x * x;
    return ((x2 * Math.log(2 / x)) / (1 + s) + Math.log1p(-x2 / (2 * (1 + s)))) / s;
  }
  return Math.log(0.5 * x) + nfwProjectionF(x);
}

/** Smallest x = R / r_s at which the profiles are evaluated: kappa diverges like ln(1/x) at the centre. */
export const nfwSmallestRadiusRatio = 1e-20;
