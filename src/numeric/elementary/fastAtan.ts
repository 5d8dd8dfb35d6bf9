import { fastLog } from './fastLog.js';

/**
 * arctan(x) by table lookup and a short series (the reduction of Gal & Bachelis 1991, ACM TOMS
 * 17, 26): for |x| <= 1, c = j/64 the nearest table point, atan|x| = atan c + atan d with
 * d = (|x| - c)/(1 + |x| c), |d| <= 1/128, and atan d = d - d^3/3 + d^5/5 - d^7/7 (truncation
 * |d|^9/9 < 1.2e-20); for |x| > 1, atan|x| = pi/2 - atan(1/|x|). Error a few ulp (checked
 * against Math.atan in test/numeric/elementary/fastElementary.test.ts); NaN stays NaN.
 */
export function fastAtan(x: number): number {
  const magnitude = Math.abs(x);
  const inverted = magnitude > 1;
  const t = inverted ? 1 / magnitude : magnitude;
  // Adding and removing 1.5 * 2^52 rounds to the nearest integer (in double arithmetic).
  const jd = t * 64 + ROUNDING_SHIFT - ROUNDING_SHIFT;
  const c = jd * (1 / 64);
  const d = (t - c) / (1 + t * c);
  const d2 = d * d;
  const reduced = ATAN_TABLE[jd | 0] + d * (1 - d2 * (1 / 3 - d2 * (0.2 - d2 * (1 / 7))));
  const angle = inverted ? HALF_PI_HIGH - reduced + HALF_PI_LOW : reduced;
  return x < 0 ? -angle : angle;
}

/**
 * artanh(z) by the reduction of fastAtan with the addition formula artanh u - artanh v =
 * artanh((u - v)/(1 - u v)) (Abramowitz & Stegun 1964, sec. 4.6): for |z| <= 7/8, c = j/128 the
 * nearest table point, artanh|z| = artanh c + artanh d with d = (|z| - c)/(1 - |z| c),
 * |d| <= (1/256)/(1 - (7/8)^2) < 0.0167 (|z| - c is exact), and artanh d = d + d^3/3 + ... + d^9/9
 * (A&S 4.6.33; truncation below d^11/10 < 2e-19 |d|). Both terms have the sign of z, so the
 * relative error is a few ulp (below 1e-15, checked against Math.atanh in
 * test/numeric/elementary/fastElementary.test.ts). Beyond 7/8 (and for NaN), ln((1 + z)/(1 - z)) / 2
 * (A&S 4.6.22) with fastLog: absolute error < 4e-16 (1 + |ln|).
 */
export function fastAtanh(z: number): number {
  const magnitude = Math.abs(z);
  if (!(magnitude <= ATANH_TABLE_END)) return 0.5 * fastLog((1 + z) / (1 - z));
  const jd = magnitude * 128 + ROUNDING_SHIFT - ROUNDING_SHIFT;
  const c = jd * (1 / 128);
  const d = (magnitude - c) / (1 - magnitude * c);
  const d2 = d * d;
  const reduced = ATANH_TABLE[jd | 0] + d * (1 + d2 * (1 / 3 + d2 * (0.2 + d2 * (1 / 7 + d2 * (1 / 9)))));
  return z < 0 ? -reduced : reduced;
}

/** Largest |z| of fastAtanh's table branch, and artanh(j/128), j = 0..112. */
const ATANH_TABLE_END = 0.875;
const ATANH_TABLE = Float64Array.from({ length: 113 }, (_, j) => Math.atanh(j / 128));
const ROUNDING_SHIFT = 6755399441055744;
/** atan(j/64), j = 0..64. */
const ATAN_TABLE = Float64Array.from({ length: 65 }, (_, j) => Math.atan(j / 64));
/** pi/2 as the double nearest it plus the remainder (fdlibm's pio2_hi, pio2_lo). */
const HALF_PI_HIGH = 1.57079632679489655800e+00;
const HALF_PI_LOW = 6.12323399573676603587e-17;

/** values[i] = fastAtan(values[i]) for i < n (a pass; see fastIsothermalEllipsoid.ts). */
export function fastAtanInPlace(values: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) values[i] = fastAtan(values[i]);
}

/** values[i] = fastAtanh(values[i]) for i < n (a pass; see fastIsothermalEllipsoid.ts). */
export function fastAtanhInPlace(values: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) values[i] = fastAtanh(values[i]);
}
