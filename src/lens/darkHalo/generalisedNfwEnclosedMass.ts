import { digamma } from '../../numeric/special/stdlibSpecial.js';
import { gaussLegendre } from '../../numeric/quadrature/gaussLegendre.js';

const EULER_GAMMA = 0.5772156649015329;
/** Gauss-Legendre points on [T, 1]: the integrand there is analytic within a Bernstein ellipse of parameter >= 5.8, so 20 points leave an error near 1e-30. */
const RULE = gaussLegendre(20);
/** Terms of the series used below T = 1/2: the k-th is below 2^-k of the first. */
const SERIES_TERMS = 60;

/**
 * Mass of the generalised NFW sphere (Zhao 1996 with (1, 3, gamma)) inside r = x r_s, in units of
 * 4 pi rho_s r_s^3:
 *   m(x) = int_0^x u^(2 - gamma) (1 + u)^(gamma - 3) du = int_0^T t^(a - 1) / (1 - t) dt,
 * with t = u / (1 + u), T = x / (1 + x), a = 3 - gamma (equal to x^a/a 2F1(a, a; a + 1; -x),
 * Abramowitz & Stegun 15.3.1 with 15.3.4; from memory). For T < 1/2 the series
 * sum_k T^(a + k) / (a + k); from T = 1/2 on, the split
 *   m = ln(1 + x) - psi(a) - gamma_E - int_T^1 (t^(a - 1) - 1) / (1 - t) dt,
 * using int_0^1 (1 - t^(a - 1)) / (1 - t) dt = psi(a) + gamma_E (A&S 6.3.22), the last integral by
 * Gauss-Legendre quadrature (its integrand is analytic on [1/2, 1]). At gamma = 1 it is the NFW's
 * ln(1 + x) - x / (1 + x). For 0 <= gamma < 3 and x >= 0.
 */
export function generalisedNfwEnclosedMassFactor(x: number, innerSlope: number): number {
  const a = 3 - innerSlope;
  const bigT = x / (1 + x);
  if (bigT < 0.5) {
    let sum = 0, power = Math.pow(bigT, a);
    for (let k = 0; k < SERIES_TERMS; k++) {
      sum += power / (a + k);
      power *= bigT;
    }
    return sum;
  }
  const half = 0.5 * (1 - bigT);
  let tail = 0;
  for (let i = 0; i < RULE.nodes.length; i++) {
    // 1 - t = half (1 - node) exactly at t = (1 + T)/2 + half node; (t^(a-1) - 1)/(1 - t) without cancellation.
    const oneMinusT = half * (1 - RULE.nodes[i]);
    tail += (RULE.weights[i] * Math.expm1((a - 1) * Math.log1p(-oneMinusT))) / oneMinusT;
  }
  return Math.log1p(x) - digamma(a) - EULER_GAMMA - half * tail;
}
