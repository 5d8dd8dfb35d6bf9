import { gaussLegendre } from '../../numeric/quadrature/gaussLegendre.js';
import { gammainc } from '../../numeric/special/stdlibSpecial.js';
import { sersicMassShapeTotal, sersicRoot } from './sersicMassShape.js';

const RULE = gaussLegendre(20);
/** Equal panels of the rule in t (R = r cosh t); the integrand changes on a scale of about 1 in t. */
const PANELS = 12;
/** The integral stops where b (X^(1/n) - 1) = CUTOFF: beyond, the density is below e^-40 of its value at R_e. */
const CUTOFF = 40;
/** Below this u = r / R the bracket B(u) comes from its series (its two terms cancel as u^3). */
const SERIES_BELOW = 0.2;

// B(u) = arcsin u - u sqrt(1 - u^2) = 2 int_0^u t^2 / sqrt(1 - t^2) dt = 2 sum_k c_k u^(2k+3)/(2k+3),
// c_k = (2k)! / (4^k k!^2) (the binomial series of (1 - t^2)^(-1/2), Abramowitz & Stegun 3.6.10).
function capBracket(u: number): number {
  if (u >= SERIES_BELOW) return Math.asin(u) - u * Math.sqrt((1 - u) * (1 + u));
  const u2 = u * u;
  let c = 1, power = u2 * u, sum = 0;
  for (let k = 0; k < 14; k++) {
    sum += (c * power) / (2 * k + 3);
    c *= (2 * k + 1) / (2 * k + 2);
    power *= u2;
  }
  return 2 * sum;
}

// f(X) = exp(-b (X^(1/n) - 1)) X^eta, as sersicMassShape.ts with b and 1/n at hand.
function density(radius: number, b: number, inverseN: number, eta: number): number {
  return Math.exp(-b * (Math.pow(radius, inverseN) - 1) + eta * Math.log(radius));
}

/**
 * Mass inside a sphere of radius x (in R_e) of the spherical body whose projection is the Sersic
 * stellar mass f(X) = exp(-b (X^(1/n) - 1)) X^eta (sersicMassShape.ts), in units of f(1) R_e^2.
 * The Abel inversion rho(s) = -(1/pi) int_s^inf f'(R) dR / sqrt(R^2 - s^2) (Binney & Tremaine 2008,
 * eq. B.72) integrated over the sphere, the order of integration exchanged, gives one integral:
 *   M(<x) = M_2D(<x) - pi x^2 f(x) - 4 int_x^inf f'(R) (R^2 / 2) B(x / R) dR,
 * B as in capBracket, with M_2D(<x) = T(n, eta) P(n(2 + eta), b x^(1/n)) (sersicMassShapeTotal, P
 * the regularised incomplete gamma function). The integral is taken over t with R = x cosh t
 * (smooth at R = x) by PANELS Gauss-Legendre panels of 20 points up to where the density has fallen
 * e^-40 below its value at R_e. About 240 evaluations: once per likelihood call where a tidal
 * radius needs it, not per pixel.
 */
export function sersicSphericalMass(x: number, sersicIndex: number, massToLightGradient: number): number {
  const n = sersicIndex, eta = massToLightGradient, b = sersicRoot(n), inverseN = 1 / n;
  const projected = sersicMassShapeTotal(n, eta) * gammainc(b * Math.pow(x, inverseN), n * (2 + eta));
  const farRadius = Math.pow(1 + CUTOFF / b, n);
  let shells = 0;
  if (farRadius > x) {
    const end = Math.acosh(farRadius / x), width = end / PANELS;
    for (let panel = 0; panel < PANELS; panel++) {
      const middle = (panel + 0.5) * width;
      for (let i = 0; i < RULE.nodes.length; i++) {
        const t = middle + 0.5 * width * RULE.nodes[i], cosh = Math.cosh(t), radius = x * cosh;
        // f'(R) = f(R) (eta - (b/n) R^(1/n)) / R; dR = x sinh t dt.
        const slope = (density(radius, b, inverseN, eta) * (eta - b * inverseN * Math.pow(radius, inverseN))) / radius;
        shells += RULE.weights[i] * slope * 0.5 * radius * radius * capBracket(1 / cosh) * x * Math.sinh(t);
      }
    }
    shells *= 0.5 * width;
  }
  return projected - Math.PI * x * x * density(x, b, inverseN, eta) - 4 * shells;
}
