import { erfc, erfcinv, erfcx } from './stdlibSpecial.js';

const SQRT2 = Math.SQRT2;
const SQRT_2_OVER_PI = Math.sqrt(2 / Math.PI);
export const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);
/** Below this log tail probability exp() would reach the subnormal range. */
const LOG_SMALLEST_DIRECT = -700;

// Standard normal quantile Phi^{-1}(p) through the inverse complementary error function,
// Phi^{-1}(p) = -sqrt(2) erfcinv(2p), each half computed from its own tail (Abramowitz & Stegun 26.2.2).
export function standardNormalQuantile(p: number): number {
  if (p < 0.5) return -SQRT2 * erfcinv(2 * p);
  return SQRT2 * erfcinv(2 * (1 - p));
}

// Upper tail Q(x) = 1 - Phi(x) = erfc(x / sqrt 2) / 2 (Abramowitz & Stegun 26.2.29).
export function upperTail(x: number): number {
  return 0.5 * erfc(x / SQRT2);
}

// log Q(x), using the scaled complementary error function erfcx(t) = exp(t^2) erfc(t) so that
// log Q(x) = log(erfcx(x / sqrt 2) / 2) - x^2 / 2 stays finite far into the upper tail.
export function logUpperTail(x: number): number {
  if (x >= 0) return Math.log(0.5 * erfcx(x / SQRT2)) - 0.5 * x * x;
  return Math.log1p(-0.5 * erfc(-x / SQRT2));
}

// Inverse of logUpperTail: the x with log Q(x) = logP (logP <= 0). Beyond the reach of erfcinv
// it solves by Newton's method with d log Q / dx = -phi(x) / Q(x) = -sqrt(2/pi) / erfcx(x / sqrt 2).
export function upperTailQuantileFromLog(logP: number): number {
  if (logP >= 0) return -Infinity;
  if (logP === -Infinity) return Infinity;
  if (logP > LOG_SMALLEST_DIRECT) {
    const p = Math.exp(logP);
    if (p <= 0.5) return SQRT2 * erfcinv(2 * p);
    return -SQRT2 * erfcinv(-2 * Math.expm1(logP));
  }
  // Mills-ratio start: log Q(x) ~ -x^2/2 - log(x sqrt(2 pi)).
  const t = -2 * logP;
  let x = Math.sqrt(t - Math.log(t * 2 * Math.PI));
  for (let iteration = 0; iteration < 60; iteration++) {
    const residual = logUpperTail(x) - logP;
    const slope = -SQRT_2_OVER_PI / erfcx(x / SQRT2);
    const step = residual / slope;
    x -= step;
    if (Math.abs(step) <= 1e-15 * x) break;
  }
  return x;
}
