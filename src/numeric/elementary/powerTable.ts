/**
 * x^h for one fixed exponent 0 < h <= 7 by the table-driven reduction of Tang (1990, ACM TOMS
 * 16, 378) used in fastLog.ts: x = 2^k c (1 + r) with c = 1 + j/256 and r in [0, 2^-8), so
 * x^h = 2^(hk) c^h (1 + r)^h, the first two factors from tables built for h and (1 + r)^h by the
 * binomial series to degree 3 (Abramowitz & Stegun 1964, 3.6.8). Its Lagrange remainder is
 * below T(h) = |C(h, 4)| 2^-32 max(1, (1 + 2^-8)^(h - 4)): at most 8.3e-9 (h = 7) and 1.0e-11
 * for h <= 1 (|C(h, 4)| <= 0.042 there), ample for the Sersic profile (see fastSersic.ts). The
 * tables hold exp(h k ln2) and exp(h ln c) rounded once, so the relative error is below
 * T(h) + (1.5 |h ln x| + 8) 2.2e-16 (checked against Math.pow in
 * test/numeric/elementary/fastElementary.test.ts). x outside [2^-100, 2^101) (zero, infinite, negative and
 * NaN included) falls back to Math.pow. Building the tables costs about 460 exponentials;
 * `setExponent` rebuilds them only when h changes.
 */
export class PowerTable {
  private exponent = Number.NaN;
  /** 2^(h k) at index k + 1023 for |k| <= 100 (k = biased exponent - 1023), and c_j^h. */
  private readonly exponentPowers = new Float64Array(2048);
  private readonly pointPowers = new Float64Array(256);
  /** Binomial coefficients C(h, i), i = 1..3. */
  private c1 = 0;
  private c2 = 0;
  private c3 = 0;

  /** The truncation bound T(h) of the series (see above) for the exponent h. */
  static truncationBound(h: number): number {
    const c4 = Math.abs((h * (h - 1) * (h - 2) * (h - 3)) / 24);
    return c4 * Math.pow(2, -32) * Math.max(1, Math.pow(1 + 1 / 256, h - 4));
  }

  /** Prepares the tables for x^h; returns false (tables untouched) unless 0 < h <= 7. */
  setExponent(h: number): boolean {
    if (!(h > 0 && h <= 7)) return false;
    if (h === this.exponent) return true;
    for (let e = 1023 - 100; e <= 1023 + 100; e++) this.exponentPowers[e] = Math.exp(h * (e - 1023) * Math.LN2);
    for (let j = 0; j < 256; j++) this.pointPowers[j] = Math.exp(h * Math.log1p(j / 256));
    this.c1 = h;
    this.c2 = (this.c1 * (h - 1)) / 2;
    this.c3 = (this.c2 * (h - 2)) / 3;
    this.exponent = h;
    return true;
  }

  /** values[i] = values[i]^h for i in [from, to), h the exponent of the last successful setExponent. */
  powerInPlace(values: Float64Array, from: number, to: number): void {
    const h = this.exponent;
    const c1 = this.c1, c2 = this.c2, c3 = this.c3;
    const exponentPowers = this.exponentPowers, pointPowers = this.pointPowers;
    for (let i = from; i < to; i++) {
      const x = values[i];
      if (!(x >= SMALLEST && x < LARGEST)) {
        values[i] = Math.pow(x, h);
        continue;
      }
      BITS[0] = x;
      const high = HIGH_WORD[HIGH_INDEX];
      const biased = high >>> 20;
      const j = (high >>> 12) & 255;
      const r = (x * INVERSE_POWERS[biased] - POINTS[j]) * INVERSE_POINTS[j];
      const series = 1 + r * (c1 + r * (c2 + r * c3));
      values[i] = exponentPowers[biased] * pointPowers[j] * series;
    }
  }
}

const SMALLEST = Math.pow(2, -100);
const LARGEST = Math.pow(2, 101);
const BITS = new Float64Array(1);
const HIGH_WORD = new Uint32Array(BITS.buffer);
const HIGH_INDEX = new Uint8Array(Float64Array.of(1).buffer)[7] === 0x3f ? 1 : 0;
const INVERSE_POWERS = Float64Array.from({ length: 2048 }, (_, e) => Math.pow(2, 1023 - e));
const POINTS = Float64Array.from({ length: 256 }, (_, j) => 1 + j / 256);
const INVERSE_POINTS = Float64Array.from({ length: 256 }, (_, j) => 1 / (1 + j / 256));
