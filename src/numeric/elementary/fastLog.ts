/**
 * ln(x) by the table-driven method of Tang (1990, ACM TOMS 16, 378): x = 2^k m with m in [1, 2),
 * c = 1 + j/256 the table point at or below m (j = the top 8 bits of m's fraction), then
 * ln x = k ln2 + ln c + ln(1 + r) with r = (m - c)/c in [0, 2^-8), ln(1 + r) by its Taylor
 * polynomial of degree 6 (truncation r^7/7 < 2.1e-18). m - c is exact (same binade); the tables
 * hold k ln2 and ln c rounded once. Absolute error below 4e-16 (1 + |ln x|) (checked against
 * Math.log in test/numeric/elementary/fastElementary.test.ts). Zero, negative, subnormal, infinite and NaN
 * arguments fall back to Math.log.
 */
export function fastLog(x: number): number {
  if (!(x >= SMALLEST_NORMAL && x <= LARGEST)) return Math.log(x);
  BITS[0] = x;
  const high = HIGH_WORD[HIGH_INDEX];
  const biased = high >>> 20;
  const j = (high >>> 12) & 255;
  // x * 2^-k is exact; it lies in [1, 2).
  const r = (x * INVERSE_POWERS[biased] - POINTS[j]) * INVERSE_POINTS[j];
  const poly = r - r * r * (0.5 - r * (1 / 3 - r * (0.25 - r * (0.2 - r * (1 / 6)))));
  return EXPONENT_LOGS[biased] + (POINT_LOGS[j] + poly);
}

const SMALLEST_NORMAL = 2.2250738585072014e-308;
const LARGEST = Number.MAX_VALUE;
/** Scratch double and its two 32-bit halves; the high half's index depends on the byte order. */
const BITS = new Float64Array(1);
const HIGH_WORD = new Uint32Array(BITS.buffer);
const HIGH_INDEX = new Uint8Array(Float64Array.of(1).buffer)[7] === 0x3f ? 1 : 0;
/** Indexed by the biased exponent e = k + 1023: 2^-k and k ln2. */
const INVERSE_POWERS = Float64Array.from({ length: 2048 }, (_, e) => Math.pow(2, 1023 - e));
const EXPONENT_LOGS = Float64Array.from({ length: 2048 }, (_, e) => (e - 1023) * Math.LN2);
/** c_j = 1 + j/256, 1/c_j and ln c_j for j = 0..255. */
const POINTS = Float64Array.from({ length: 256 }, (_, j) => 1 + j / 256);
const INVERSE_POINTS = Float64Array.from({ length: 256 }, (_, j) => 1 / (1 + j / 256));
const POINT_LOGS = Float64Array.from({ length: 256 }, (_, j) => Math.log1p(j / 256));
