/**
 * exp(x) by the table-driven method of Tang (1989, ACM TOMS 15, 144): x = (64 m + j) ln2/64 + r
 * with j = 0..63, |r| <= ln2/128, exp(x) = 2^m 2^(j/64) exp(r), exp(r) by its Taylor polynomial
 * of degree 3: truncation |r|^4/24 e^|r| < 3.7e-11 relative, far below the forward model's needs
 * (its tolerance is about 1e-5 of a basis peak). The reduction uses ln2/64 rounded once, so r
 * errs by about 2.2e-16 |x| absolute; the tables hold correctly rounded values. Relative error
 * below 3.7e-11 + 2.3e-16 |x| (< 3.9e-11 on the whole range; checked against Math.exp in
 * test/numeric/elementary/fastElementary.test.ts). Outside (-708, 709), where results are subnormal or
 * overflow, and for NaN it falls back to Math.exp.
 */
export function fastExp(x: number): number {
  if (!(x > -708 && x < 709)) return Math.exp(x);
  // Adding and removing 1.5 * 2^52 rounds to the nearest integer (in double arithmetic).
  const kd = x * INVERSE_STEP + ROUNDING_SHIFT - ROUNDING_SHIFT;
  const r = x - kd * STEP;
  const k = kd | 0;
  const p = 1 + r * (1 + r * (0.5 + r * (1 / 6)));
  return (FRACTIONAL_POWERS[k & 63] * p) * POWERS_OF_TWO[(k >> 6) + POWER_OFFSET];
}

const INVERSE_STEP = 64 / Math.LN2;
const ROUNDING_SHIFT = 6755399441055744;
const STEP = Math.LN2 / 64;
/** 2^(j/64), j = 0..63. */
const FRACTIONAL_POWERS = Float64Array.from({ length: 64 }, (_, j) => Math.pow(2, j / 64));
/** 2^m for m = -1030..1030 at index m + 1030. */
const POWER_OFFSET = 1030;
const POWERS_OF_TWO = Float64Array.from({ length: 2061 }, (_, i) => Math.pow(2, i - POWER_OFFSET));

