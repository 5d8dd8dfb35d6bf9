import { erfcinv, erfcx } from '../numeric/special/stdlibSpecial.js';
import { InputError, expectedFound } from '../errors.js';

/** Below this ln p the p-value itself would leave the normal double range; sigma is found from ln p. */
const LN_P_DIRECT_FLOOR = -700;

/**
 * Sellke, Bayarri & Berger 2001 (Am. Stat. 55, 62): for a p-value p < 1/e, the Bayes factor of the null over
 * the alternative is at least B(p) = -e p ln p (over a wide class of alternatives); 1 for p >= 1/e.
 */
export function bayesFactorBoundFromPValue(pValue: number): number {
  if (!(pValue > 0 && pValue <= 1)) {
    throw new InputError(`p-value: ${expectedFound('a number in (0, 1]', pValue)}`);
  }
  return pValue < Math.exp(-1) ? -Math.E * pValue * Math.log(pValue) : 1;
}

/**
 * Inverse of the Sellke, Bayarri & Berger 2001 bound: ln of the smallest p-value p in (0, 1/e) with
 * -e p ln p = 1 / B10, for B10 = exp(lnBayesFactor10) the Bayes factor of the alternative over the
 * null. Solved in u = ln p, where the equation reads u + ln(-u) + 1 + ln B10 = 0 (increasing in u
 * on u < -1), by bisection to full precision. NaN when B10 <= 1 (no evidence against the null).
 */
export function lnPValueBound(lnBayesFactor10: number): number {
  if (Number.isNaN(lnBayesFactor10)) {
    throw new InputError(`ln Bayes factor: ${expectedFound('a number', lnBayesFactor10)}`);
  }
  if (!(lnBayesFactor10 > 0)) return NaN;
  if (lnBayesFactor10 === Infinity) return -Infinity;
  const g = (u: number): number => u + Math.log(-u) + 1 + lnBayesFactor10;
  // g(-1) = ln B10 > 0; g(-2 (ln B10 + 2)) = ln(2 ln B10 + 4) - ln B10 - 3 < 0.
  let high = -1;
  let low = -2 * (lnBayesFactor10 + 2);
  for (let step = 0; step < 200; step++) {
    const middle = 0.5 * (low + high);
    if (middle <= low || middle >= high) break;
    if (g(middle) > 0) high = middle;
    else low = middle;
  }
  return 0.5 * (low + high);
}

/** Two-sided Gaussian significance z with p = erfc(z / sqrt 2) = P(|N(0, 1)| > z), from ln p. */
export function twoSidedSigmaFromLnP(lnP: number): number {
  if (Number.isNaN(lnP) || lnP > 0) {
    throw new InputError(`ln p-value: ${expectedFound('a number <= 0', lnP)}`);
  }
  if (lnP >= LN_P_DIRECT_FLOOR) return Math.SQRT2 * erfcinv(Math.exp(lnP));
  if (lnP === -Infinity) return Infinity;
  // ln p = ln erfcx(z / sqrt 2) - z^2 / 2 (erfc = erfcx exp(-x^2)), solved for z by Newton's method;
  // d ln p / dz = -sqrt(2/pi) / erfcx(z / sqrt 2) (the Gaussian density over the tail).
  let z = Math.sqrt(-2 * lnP);
  for (let step = 0; step < 50; step++) {
    const scaled = erfcx(z / Math.SQRT2);
    const residual = Math.log(scaled) - 0.5 * z * z - lnP;
    const next = z + residual / (Math.sqrt(2 / Math.PI) / scaled);
    if (Math.abs(next - z) <= 1e-15 * z) return next;
    z = next;
  }
  return z;
}

/** The Sellke, Bayarri & Berger 2001 calibration of an observed Bayes factor, read as a p-value. */
export interface SignificanceBound {
  readonly lnBayesFactor10: number;
  /** Smallest p-value consistent with the Bayes factor; NaN when B10 <= 1. */
  readonly pValue: number;
  /** ln of pValue (exact where pValue underflows); NaN when B10 <= 1. */
  readonly lnPValue: number;
  /** Equivalent two-sided Gaussian significance in sigma; NaN when B10 <= 1. */
  readonly sigma: number;
  /** e.g. "at most as significant as a p-value of 0.0032 (2.9 sigma, two-sided)". */
  readonly reading: string;
}

/**
 * Reads B10 = exp(lnBayesFactor10) through the bound of Sellke, Bayarri & Berger 2001: data with
 * p-value p never give B10 above 1 / (-e p ln p), so an observed B10 is at most as significant as
 * the p-value that attains it, and at most the two-sided Gaussian sigma of that p-value.
 */
export function significanceBound(lnBayesFactor10: number): SignificanceBound {
  const lnPValue = lnPValueBound(lnBayesFactor10);
  if (Number.isNaN(lnPValue)) {
    return {
      lnBayesFactor10,
      pValue: NaN,
      lnPValue: NaN,
      sigma: NaN,
      reading: 'a Bayes factor of at most 1 carries no evidence against the null model',
    };
  }
  const pValue = Math.exp(lnPValue);
  const sigma = twoSidedSigmaFromLnP(lnPValue);
  const pText = pValue > 0 ? pValue.toPrecision(2) : `exp(${lnPValue.toPrecision(6)})`;
  return {
    lnBayesFactor10,
    pValue,
    lnPValue,
    sigma,
    reading: `at most as significant as a p-value of ${pText} (${sigma.toFixed(1)} sigma, two-sided)`,
  };
}
