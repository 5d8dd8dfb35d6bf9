/** Step of the trapezoidal rule in t (see below): the error bound exp(-pi^2 / h) is 7e-18. */
const STEP = 0.25;
/** The rule stops at t = max(ln(2/X), 0) + TAIL, the integrand there below e^(-2 TAIL) = 4e-18 of its size at ln(2/X). */
const TAIL = 20;

/**
 * Projected density of the generalised NFW profile (Zhao 1996, MNRAS 278, 488, with (alpha, beta,
 * gamma) = (1, 3, gamma); in lensing e.g. Wyithe, Turner & Spergel 2001, ApJ 555, 504),
 *   rho = rho_s / ((r/r_s)^gamma (1 + r/r_s)^(3 - gamma)),
 * as kappa / kappa_s with kappa_s = rho_s r_s / Sigma_crit at X = R / r_s:
 *   G(X) = 2 int_0^inf rho(sqrt(X^2 + z^2)) / rho_s dz = 2 int_0^inf r^(1 - gamma) (1 + r)^(gamma - 3) dt,
 * with z = X sinh t, r = X cosh t (so dz = r dt). The integrand in t is analytic in the strip
 * |Im t| < pi/2 and decays like e^(-2t), so the trapezoidal rule converges geometrically, with
 * error about exp(-2 pi (pi/2) / h) (Trefethen & Weideman 2014, SIAM Review 56, 385, sec. 5). At gamma = 1
 * it is the NFW's 2 (1 - F(X)) / (X^2 - 1) (Bartelmann 1996). For 0 <= gamma < 2. Not a hot path:
 * Gaussian expansions of the profile sample it a few hundred times per inner slope.
 */
export function generalisedNfwConvergenceShape(bigX: number, innerSlope: number): number {
  const end = Math.max(Math.log(2 / bigX), 0) + TAIL;
  const steps = Math.ceil(end / STEP);
  const inner = 1 - innerSlope, outer = innerSlope - 3;
  let sum = 0.5 * integrand(bigX, 0, inner, outer);
  for (let k = 1; k <= steps; k++) sum += integrand(bigX, k * STEP, inner, outer);
  return 2 * STEP * sum;
}

// r^(1 - gamma) (1 + r)^(gamma - 3) at r = X cosh t: rho(r) / rho_s times dz/dt = r.
function integrand(bigX: number, t: number, inner: number, outer: number): number {
  const r = bigX * Math.cosh(t);
  return Math.exp(inner * Math.log(r) + outer * Math.log1p(r));
}
