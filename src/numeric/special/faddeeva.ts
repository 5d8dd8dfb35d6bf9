/**
 * The Faddeeva function w(z) = exp(-z^2) erfc(-i z) (Abramowitz & Stegun 1972, 7.1.3), z = x + i y,
 * written into out[outOffset] (real part) and out[outOffset + 1] (imaginary part); allocates nothing.
 *
 * Upper half-plane (y >= 0):
 * - |z| < CONTINUED_FRACTION_FROM: the rational approximation of Weideman 1994 (SIAM J. Numer. Anal.
 *   31, 1497, eqs. 38-39 and the program in its appendix; from memory) with N = 40 terms,
 *   w = 2 p(Z) / (L - i z)^2 + pi^(-1/2) / (L - i z),  Z = (L + i z)/(L - i z),  L = 2^(-1/4) sqrt(N),
 *   the coefficients of p computed once from the discrete Fourier transform the paper gives.
 * - beyond: the Laplace continued fraction w = (i / sqrt(pi)) / (z - (1/2) / (z - 1 / (z - (3/2) / ...)))
 *   (Gautschi 1970, SIAM J. Numer. Anal. 7, 187; Abramowitz & Stegun 7.1.4), 20 levels.
 * Lower half-plane by the reflection w(z) = 2 exp(-z^2) - w(-z) (A&S 7.1.11), which overflows for
 * large |z| where w itself does. Measured against scipy.special.wofz over 1e-6 <= |z| <= 1e6
 * (test/numeric/special/faddeeva.test.ts): relative error below 5e-14 in the upper half-plane.
 */
export function faddeeva(x: number, y: number, out: Float64Array, outOffset = 0): void {
  if (y >= 0) {
    upperHalf(x, y, out, outOffset);
    return;
  }
  upperHalf(-x, -y, out, outOffset);
  // 2 exp(-z^2) - w(-z), exp(-z^2) = exp(y^2 - x^2) (cos 2xy - i sin 2xy).
  const modulus = 2 * Math.exp((y - x) * (y + x)), phase = 2 * x * y;
  out[outOffset] = modulus * Math.cos(phase) - out[outOffset];
  out[outOffset + 1] = -modulus * Math.sin(phase) - out[outOffset + 1];
}

/** Number of terms N of Weideman's rational approximation. */
const TERMS = 40;
/** |z| from which the continued fraction replaces the rational approximation. */
const CONTINUED_FRACTION_FROM = 6;
/** Levels of the continued fraction (at |z| >= 6 the 20th changes w by less than 1e-16 relative). */
const LEVELS = 20;
const INVERSE_ROOT_PI = 1 / Math.sqrt(Math.PI);
const SCALE_L = Math.sqrt(TERMS / Math.SQRT2);

/**
 * Coefficients a_N, ..., a_1 of p (highest power first) from Weideman 1994: with M = 2N and
 * f(t) = exp(-t^2)(L^2 + t^2) sampled at t_k = L tan(theta_k / 2), theta_k = k pi / M,
 * k = -M + 1 .. M - 1 (and f = 0 at theta = -pi), a_n is the real part of the n-th discrete
 * Fourier coefficient of the samples over the 2M points of [-pi, pi).
 */
function weidemanCoefficients(): Float64Array {
  const m = 2 * TERMS, points = 2 * m;
  const samples = new Float64Array(points);
  // Index j of the shifted sequence holds theta = (j - M) pi / M (so j = 0 is theta = -pi, f = 0).
  for (let j = 1; j < points; j++) {
    const t = SCALE_L * Math.tan(((j - m) * Math.PI) / (2 * m));
    samples[j] = Math.exp(-t * t) * (SCALE_L * SCALE_L + t * t);
  }
  const coefficients = new Float64Array(TERMS);
  for (let n = 1; n <= TERMS; n++) {
    // Real part of sum_j f_j exp(-2 pi i n j' / (2M)) with j' the index after fftshift, j' = j - M mod 2M.
    let sum = 0;
    for (let j = 0; j < points; j++) sum += samples[j] * Math.cos((Math.PI * n * (j - m)) / m);
    coefficients[TERMS - n] = sum / points;
  }
  return coefficients;
}

const COEFFICIENTS = weidemanCoefficients();

function upperHalf(x: number, y: number, out: Float64Array, outOffset: number): void {
  if (x * x + y * y >= CONTINUED_FRACTION_FROM * CONTINUED_FRACTION_FROM) {
    continuedFraction(x, y, out, outOffset);
    return;
  }
  // d = L - i z = (L + y) - i x;  Z = (L + i z) / d = ((L - y) + i x) / d.
  const dr = SCALE_L + y, di = -x;
  const inverseModulus2 = 1 / (dr * dr + di * di);
  const nr = SCALE_L - y, ni = x;
  const zr = (nr * dr + ni * di) * inverseModulus2, zi = (ni * dr - nr * di) * inverseModulus2;
  let pr = COEFFICIENTS[0], pi = 0;
  for (let k = 1; k < TERMS; k++) {
    const next = pr * zr - pi * zi + COEFFICIENTS[k];
    pi = pr * zi + pi * zr;
    pr = next;
  }
  // 1/d = conj(d) / |d|^2;  w = (2 p / d + pi^(-1/2)) / d.
  const ir = dr * inverseModulus2, ii = -di * inverseModulus2;
  const qr = 2 * (pr * ir - pi * ii) + INVERSE_ROOT_PI, qi = 2 * (pr * ii + pi * ir);
  out[outOffset] = qr * ir - qi * ii;
  out[outOffset + 1] = qr * ii + qi * ir;
}

// Laplace continued fraction of w (Gautschi 1970), evaluated from the bottom level up.
function continuedFraction(x: number, y: number, out: Float64Array, outOffset: number): void {
  let rr = 0, ri = 0;
  for (let k = LEVELS; k >= 1; k--) {
    // r = (k/2) / (z - r)
    const dr = x - rr, di = y - ri, scale = (0.5 * k) / (dr * dr + di * di);
    rr = dr * scale;
    ri = -di * scale;
  }
  // w = (i / sqrt(pi)) / (z - r)
  const dr = x - rr, di = y - ri, scale = INVERSE_ROOT_PI / (dr * dr + di * di);
  out[outOffset] = di * scale;
  out[outOffset + 1] = dr * scale;
}
