import { gammaincinv, gammaln } from '../../numeric/special/stdlibSpecial.js';

/**
 * b_n of the Sersic law, the root of P(2n, b_n) = 1/2 (Ciotti 1991; Graham & Driver 2005, PASA 22,
 * 118, eq. 4) by the inverse incomplete gamma function. The lens light takes b_n from the
 * Ciotti & Bertin (1999) expansion of the same root, 7e-8 away at n = 4 and 2.5e-5 at n = 1
 * (light/sersic/sersicCoefficient.ts), far below what changes a model image.
 */
export function sersicRoot(sersicIndex: number): number {
  if (sersicIndex !== cachedIndex) {
    cachedIndex = sersicIndex;
    cachedRoot = gammaincinv(0.5, 2 * sersicIndex);
  }
  return cachedRoot;
}

let cachedIndex = Number.NaN;
let cachedRoot = Number.NaN;

/**
 * The stellar surface density in units of its value at R_e, X = R / R_e:
 *   f(X) = exp(-b_n (X^(1/n) - 1)) X^eta,
 * the Sersic light (Sersic 1968; Graham & Driver 2005, eq. 1) times a mass-to-light ratio
 * Upsilon(R) = Upsilon_e (R / R_e)^eta, eta = massToLightGradient (0: mass follows light; a
 * power-law gradient is common practice in joint lensing and stellar-population work).
 */
export function sersicMassShape(bigX: number, sersicIndex: number, massToLightGradient: number): number {
  const b = sersicRoot(sersicIndex);
  return Math.exp(-b * (Math.pow(bigX, 1 / sersicIndex) - 1) + massToLightGradient * Math.log(bigX));
}

// Total of f over the plane in units of R_e^2: int_0^inf f(X) 2 pi X dX = 2 pi n e^b b^(-n(2 + eta)) Gamma(n(2 + eta))
// (substitute u = b X^(1/n); at eta = 0 this is Graham & Driver 2005, eq. 2). Finite for eta > -2.
export function sersicMassShapeTotal(sersicIndex: number, massToLightGradient: number): number {
  const b = sersicRoot(sersicIndex), shape = sersicIndex * (2 + massToLightGradient);
  return 2 * Math.PI * sersicIndex * Math.exp(b - shape * Math.log(b) + gammaln(shape));
}
