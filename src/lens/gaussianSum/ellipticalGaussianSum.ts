import { faddeeva } from '../../numeric/special/faddeeva.js';
import type { GaussianExpansion } from '../../numeric/approximation/gaussianExpansion.js';

/**
 * Concentric elliptical Gaussians sharing an axis ratio and a position angle, in arcsift's
 * intermediate-axis convention: in the frame x' along the major axis,
 *   kappa = sum_j a_j exp(-xi^2 / (2 s_j^2)),   xi^2 = q x'^2 + y'^2 / q,
 * a_j = `amplitudes` (convergence at the centre), s_j = `widths` (arcsec), the first `count` of each.
 * A unit-scale expansion is placed with `setScaled` (no allocation once the buffers are large enough).
 */
export class EllipticalGaussianSum {
  amplitudes = new Float64Array(64);
  widths = new Float64Array(64);
  count = 0;

  /** a_j = amplitudeScale * expansion a_j, s_j = radiusScale * expansion s_j. */
  setScaled(expansion: GaussianExpansion, amplitudeScale: number, radiusScale: number): void {
    const count = expansion.widths.length;
    if (this.widths.length < count) {
      this.amplitudes = new Float64Array(count);
      this.widths = new Float64Array(count);
    }
    for (let j = 0; j < count; j++) {
      this.amplitudes[j] = amplitudeScale * expansion.amplitudes[j];
      this.widths[j] = radiusScale * expansion.widths[j];
    }
    this.count = count;
  }
}

const DEG = Math.PI / 180;
/** Faddeeva values w(z1), w(z2) of the current Gaussian (re, im, re, im). */
const w = new Float64Array(4);
/** The bracket w(z1) - exp(-xi^2/(2 s^2)) w(z2) of the current Gaussian (re, im). */
const bracket = new Float64Array(2);
/** Below this |z|^2 the bracket comes from its power series (see gaussianBracket). */
const SERIES_BELOW = 0.5;
/** Terms of that series: the first dropped is below 0.5^15 / 15! = 2e-17 of the first. */
const SERIES_TERMS = 15;
/** Terms of the short-segment series: the first dropped is below 1/22! = 9e-22 of the bound. */
const SEGMENT_TERMS = 21;
const TWO_OVER_ROOT_PI = 2 / Math.sqrt(Math.PI);

// Deflection of an elliptical Gaussian convergence through the Faddeeva function (Bassetti & Erskine
// 1980, CERN-ISR-TH/80-06, for the field of an elliptical Gaussian charge; in lensing Shajib 2019,
// MNRAS 488, 1387, sec. 4; from memory, checked against the homoeoid integral in the tests). In the
// major-axis frame with X = |x'|, Y = |y'| >= 0, e^2 = 1 - q^2, c = sqrt(q) / (s sqrt(2 e^2)):
//   alpha_y' + i alpha_x' = a s sqrt(2 pi q / e^2) [w(c (X + iY)) - exp(-xi^2/(2 s^2)) w(c (q X + iY/q))],
// the signs of x', y' restored afterwards. At q = 1 the circular form
// alpha = 2 a s^2 (1 - exp(-r^2 / (2 s^2))) / r (radial) replaces it.
export function addEllipticalGaussianSumDeflection(
  sum: EllipticalGaussianSum, q: number, positionAngleDeg: number, cx: number, cy: number,
  x: Float64Array, y: Float64Array, n: number, alphaX: Float64Array, alphaY: Float64Array,
): void {
  const angle = positionAngleDeg * DEG, cos = Math.cos(angle), sin = Math.sin(angle);
  const e2 = (1 - q) * (1 + q);
  if (e2 === 0) {
    addCircularDeflection(sum, cx, cy, x, y, n, alphaX, alphaY);
    return;
  }
  const { amplitudes, widths, count } = sum;
  const prefactor = Math.sqrt((2 * Math.PI * q) / e2), scaleZ = Math.sqrt(q / (2 * e2)), inverseQ = 1 / q, oneMinusQ = 1 - q;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - cx, dy = y[i] - cy;
    const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
    const bigX = Math.abs(xr), bigY = Math.abs(yr);
    const xi2 = q * bigX * bigX + inverseQ * bigY * bigY;
    let sumX = 0, sumY = 0;
    for (let j = 0; j < count; j++) {
      const s = widths[j];
      gaussianBracket(scaleZ / s, bigX, bigY, q, oneMinusQ, Math.exp((-0.5 * xi2) / (s * s)));
      const scale = amplitudes[j] * s * prefactor;
      sumY += scale * bracket[0];
      sumX += scale * bracket[1];
    }
    const ax = xr < 0 ? -sumX : sumX, ay = yr < 0 ? -sumY : sumY;
    alphaX[i] += cos * ax - sin * ay;
    alphaY[i] += sin * ax + cos * ay;
  }
}

/**
 * bracket = w(z1) - damping w(z2), z1 = c (X + iY), z2 = c (q X + iY/q), damping = exp(-xi^2/(2 s^2)).
 * Since z1^2 - z2^2 = xi^2 / (2 s^2), it equals -(2i/sqrt(pi)) exp(-z1^2) int_z1^z2 exp(t^2) dt
 * (from w(z) = exp(-z^2) erfc(-iz), A&S 7.1.3). The two Faddeeva values nearly cancel where
 * z2 - z1 = D is small beside 1/|z1| (near the centre, or q near 1: the cancellation factor grows
 * like s / (r sqrt(1 - q^2)) or s^2 / r^2), so there the integral is summed instead:
 * - when 2 |z1| |D| + |D|^2 < 1: exp(-z1^2) int_z1^z2 exp(t^2) dt = int_0^D exp(2 z1 u + u^2) du
 *   = sum_n a_n D^(n+1) / (n + 1), a_0 = 1, a_1 = 2 z1, (n + 1) a_(n+1) = 2 z1 a_n + 2 a_(n-1)
 *   (from f' = (2 z1 + 2u) f), |a_n D^n| below 1/n! of the bound;
 * - else when both |z|^2 < 1/2: int_z1^z2 exp(t^2) dt = D sum_k P_(2k+1) / (k! (2k + 1)),
 *   P_m = (z2^m - z1^m)/D by P_(m+1) = z2 P_m + z1^m;
 * D = c (-(1 - q) X + i (1 - q) Y / q) is free of cancellation.
 */
function gaussianBracket(c: number, bigX: number, bigY: number, q: number, oneMinusQ: number, damping: number): void {
  const z1r = c * bigX, z1i = c * bigY, z2r = q * z1r, z2i = z1i / q;
  const dr = -c * oneMinusQ * bigX, di = (c * oneMinusQ * bigY) / q;
  const d2 = dr * dr + di * di, z12 = z1r * z1r + z1i * z1i;
  if (2 * Math.sqrt(z12 * d2) + d2 < 1) {
    shortSegment(z1r, z1i, dr, di);
    return;
  }
  if (z12 >= SERIES_BELOW || z2r * z2r + z2i * z2i >= SERIES_BELOW) {
    faddeeva(z1r, z1i, w, 0);
    faddeeva(z2r, z2i, w, 2);
    bracket[0] = w[0] - damping * w[2];
    bracket[1] = w[1] - damping * w[3];
    return;
  }
  smallArguments(z1r, z1i, z2r, z2i, dr, di);
}

// bracket = -(2i/sqrt pi) sum_n a_n D^(n+1)/(n+1), the first series above.
function shortSegment(z1r: number, z1i: number, dr: number, di: number): void {
  const twoR = 2 * z1r, twoI = 2 * z1i;
  let previousR = 0, previousI = 0, ar = 1, ai = 0, powerR = dr, powerI = di, sumR = dr, sumI = di;
  for (let n = 0; n < SEGMENT_TERMS; n++) {
    const nextR = (twoR * ar - twoI * ai + 2 * previousR) / (n + 1);
    const nextI = (twoR * ai + twoI * ar + 2 * previousI) / (n + 1);
    previousR = ar; previousI = ai; ar = nextR; ai = nextI;
    const p = powerR * dr - powerI * di;
    powerI = powerR * di + powerI * dr;
    powerR = p;
    sumR += (ar * powerR - ai * powerI) / (n + 2);
    sumI += (ar * powerI + ai * powerR) / (n + 2);
  }
  bracket[0] = TWO_OVER_ROOT_PI * sumI;
  bracket[1] = -TWO_OVER_ROOT_PI * sumR;
}

// bracket = -(2i/sqrt pi) exp(-z1^2) D sum_k P_(2k+1) / (k! (2k+1)), the second series above.
function smallArguments(z1r: number, z1i: number, z2r: number, z2i: number, dr: number, di: number): void {
  let pr = 1, pi = 0, er = z1r, ei = z1i, sr = 1, si = 0, factorial = 1;
  for (let m = 1; m < 2 * SERIES_TERMS - 1; m++) {
    const nextR = z2r * pr - z2i * pi + er;
    pi = z2r * pi + z2i * pr + ei;
    pr = nextR;
    const nextE = er * z1r - ei * z1i;
    ei = er * z1i + ei * z1r;
    er = nextE;
    if ((m & 1) === 0) {
      const k = m >> 1;
      factorial *= k;
      const weight = 1 / (factorial * (2 * k + 1));
      sr += weight * pr;
      si += weight * pi;
    }
  }
  // exp(-z1^2) = exp(z1i^2 - z1r^2)(cos 2 z1r z1i - i sin 2 z1r z1i).
  const integralR = dr * sr - di * si, integralI = dr * si + di * sr;
  const modulus = TWO_OVER_ROOT_PI * Math.exp((z1i - z1r) * (z1i + z1r)), phase = 2 * z1r * z1i;
  const fr = modulus * Math.cos(phase), fi = -modulus * Math.sin(phase);
  bracket[0] = fr * integralI + fi * integralR;
  bracket[1] = -(fr * integralR - fi * integralI);
}

// Circular Gaussian: enclosed mass 2 pi a s^2 (1 - exp(-r^2/(2 s^2))), alpha = M(<r) / (pi r) in
// units of Sigma_crit (Schneider, Ehlers & Falco 1992, axially symmetric lenses).
function addCircularDeflection(
  sum: EllipticalGaussianSum, cx: number, cy: number,
  x: Float64Array, y: Float64Array, n: number, alphaX: Float64Array, alphaY: Float64Array,
): void {
  const { amplitudes, widths, count } = sum;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - cx, dy = y[i] - cy, r2 = dx * dx + dy * dy;
    if (r2 === 0) continue;
    let factor = 0;
    for (let j = 0; j < count; j++) {
      const s = widths[j];
      factor -= 2 * amplitudes[j] * s * s * Math.expm1((-0.5 * r2) / (s * s));
    }
    factor /= r2;
    alphaX[i] += factor * dx;
    alphaY[i] += factor * dy;
  }
}

// The convergence of the sum, the definition above.
export function addEllipticalGaussianSumConvergence(
  sum: EllipticalGaussianSum, q: number, positionAngleDeg: number, cx: number, cy: number,
  x: Float64Array, y: Float64Array, n: number, kappa: Float64Array,
): void {
  const angle = positionAngleDeg * DEG, cos = Math.cos(angle), sin = Math.sin(angle), inverseQ = 1 / q;
  const { amplitudes, widths, count } = sum;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - cx, dy = y[i] - cy;
    const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
    const xi2 = q * xr * xr + inverseQ * yr * yr;
    let value = 0;
    for (let j = 0; j < count; j++) value += amplitudes[j] * Math.exp((-0.5 * xi2) / (widths[j] * widths[j]));
    kappa[i] += value;
  }
}
