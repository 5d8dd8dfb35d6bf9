/**
 * exp(x) by the table-driven method of Tang (1989, ACM TOMS 15, 144): x = (64 m + j) ln2/64 + r
 * with j = 0..63, |r| <= ln2/128, exp(x) = 2^m 2^(j/64) exp(r), exp(r) by its Taylor polynomial
 * of degree 5. Truncation: |r|^6/720 e^|r| < 3.6e-17 relative. The reduction uses ln2/64 in two
 * parts (Cody & Waite 1980; the split of fdlibm's e_exp.c), the high part of 32 significant bits
 * so that k * high is exact for |k| < 2^21; the tables hold correctly rounded values. Total relative error below 1e-15
 * (a few ulp; checked against Math.exp in test/model/fastElementary.test.ts). Outside
 * (-708, 709), where results are subnormal or overflow, and for NaN it falls back to Math.exp.
 */
export function fastExp(x: number): number {
  if (!(x > -708 && x < 709)) return Math.exp(x);
  // Adding and removing 1.5 * 2^52 rounds to the nearest integer (in double arithmetic).
  const kd = x * INVERSE_STEP + ROUNDING_SHIFT - ROUNDING_SHIFT;
  const r = x - kd * STEP_HIGH - kd * STEP_LOW;
  const k = kd | 0;
  const p = 1 + r * (1 + r * (0.5 + r * (1 / 6 + r * (1 / 24 + r * (1 / 120)))));
  return (FRACTIONAL_POWERS[k & 63] * p) * POWERS_OF_TWO[(k >> 6) + POWER_OFFSET];
}

const INVERSE_STEP = 64 / Math.LN2;
const ROUNDING_SHIFT = 6755399441055744;
/** ln2 = 6.93147180369123816490e-01 + 1.90821492927058770002e-10 (fdlibm), divided by 64. */
const STEP_HIGH = 6.93147180369123816490e-01 / 64;
const STEP_LOW = 1.90821492927058770002e-10 / 64;
/** 2^(j/64), j = 0..63. */
const FRACTIONAL_POWERS = Float64Array.from({ length: 64 }, (_, j) => Math.pow(2, j / 64));
/** 2^m for m = -1030..1030 at index m + 1030. */
const POWER_OFFSET = 1030;
const POWERS_OF_TWO = Float64Array.from({ length: 2061 }, (_, i) => Math.pow(2, i - POWER_OFFSET));

