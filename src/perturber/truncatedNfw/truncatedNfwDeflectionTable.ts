import { truncatedNfw } from './truncatedNfw.js';

/** Octaves of v = u^2 covered: [2^LOWEST_OCTAVE, 2^(LOWEST_OCTAVE + OCTAVES)), u = 1/128 .. 256. */
const LOWEST_OCTAVE = -14;
const OCTAVES = 30;
/** Intervals per octave, and the degree of the interpolating polynomial (DEGREE + 1 nodes). */
const INTERVALS = 64;
const DEGREE = 7;
/** Nodes of one interval at t = -3..4 (t in interval widths from its left end). */
const FIRST_NODE = -3;
const NODES_PER_OCTAVE = INTERVALS + DEGREE;

/**
 * The radial factor of the truncated NFW deflection of src/perturber/truncatedNfw.ts,
 * G(v) = bracket(u)/u^2 with v = u^2 (alpha = 4 kappa_s P G(v) (theta - centre)), which depends
 * on the truncation ratio tau alone, tabulated for one tau: in each octave of v, 64 equal
 * intervals, on each a polynomial of degree 7 in the position t in [0, 1) through the values at
 * t = -3..4 (Lagrange interpolation, Abramowitz & Stegun 1964, 25.2.2). The values come from
 * truncatedNfw.ts itself. Interpolation error |omega(t)| h^8 |G^(8)| / 8! with |omega| < 43 on
 * [0, 1] and h/v <= 1/64: for G ~ 1/v (outside the truncation radius) that is below
 * 43 (1/64)^8 = 1.5e-13 relative; with the roundings of the coefficients the test
 * (test/perturber/truncatedNfw/fastTruncatedNfw.test.ts) measures 6e-13 and checks the deflection against
 * truncatedNfw.ts to 1e-12 relative for tau = 0.5, 3 and 15 over u = 1e-4..300 (inside and
 * outside the table). `build` evaluates the profile at 2130 points (about 0.1 ms).
 */
export class TruncatedNfwDeflectionTable {
  /** The truncation ratio tabulated (NaN before the first build). */
  truncationRatio = Number.NaN;
  /** Coefficients c_0..c_7 of interval i of octave o at ((o * INTERVALS) + i) * 8. */
  readonly coefficients = new Float64Array(OCTAVES * INTERVALS * (DEGREE + 1));
  private readonly x = new Float64Array(OCTAVES * NODES_PER_OCTAVE);
  private readonly y = new Float64Array(OCTAVES * NODES_PER_OCTAVE);
  private readonly alphaX = new Float64Array(OCTAVES * NODES_PER_OCTAVE);
  private readonly alphaY = new Float64Array(OCTAVES * NODES_PER_OCTAVE);
  private readonly parameters = new Float64Array(5);

  /** Tabulates G for truncation ratio tau. */
  build(tau: number): void {
    const x = this.x;
    for (let o = 0; o < OCTAVES; o++) {
      const octave = Math.pow(2, LOWEST_OCTAVE + o);
      for (let node = 0; node < NODES_PER_OCTAVE; node++) {
        const v = octave * (1 + (node + FIRST_NODE) / INTERVALS);
        x[o * NODES_PER_OCTAVE + node] = Math.sqrt(v);
      }
    }
    // Unit scale radius, centre at the origin, kappa_s with 4 kappa_s P = 1: alpha_x = G(v) u.
    const p = this.parameters;
    p[0] = ((tau * tau + 1) * (tau * tau + 1)) / (4 * tau * tau);
    p[1] = 1;
    p[2] = tau;
    p[3] = 0;
    p[4] = 0;
    this.alphaX.fill(0);
    this.alphaY.fill(0);
    truncatedNfw.addDeflection(p, 0, x, this.y, x.length, this.alphaX, this.alphaY);
    const c = this.coefficients;
    for (let o = 0; o < OCTAVES; o++) {
      for (let i = 0; i < INTERVALS; i++) {
        const out = (o * INTERVALS + i) * (DEGREE + 1);
        for (let j = 0; j <= DEGREE; j++) {
          let sum = 0;
          for (let a = 0; a <= DEGREE; a++) {
            const node = o * NODES_PER_OCTAVE + i + a;
            sum += MONOMIAL_FROM_VALUES[j * (DEGREE + 1) + a] * (this.alphaX[node] / x[node]);
          }
          c[out + j] = sum;
        }
      }
    }
    this.truncationRatio = tau;
  }

  /**
   * values[i] = G(values[i]) for i < n where v = values[i] lies in the table's range
   * [2^-14, 2^16); NaN elsewhere (the caller evaluates those points otherwise).
   */
  lookupInPlace(values: Float64Array, n: number): void {
    const c = this.coefficients;
    for (let i = 0; i < n; i++) {
      const v = values[i];
      if (!(v >= TABLE_LOWEST_V && v < TABLE_HIGHEST_V)) {
        values[i] = Number.NaN;
        continue;
      }
      BITS[0] = v;
      const biased = HIGH_WORD[HIGH_INDEX] >>> 20;
      // v 2^-k is exact and lies in [1, 2).
      const s = (v * INVERSE_POWERS[biased] - 1) * INTERVALS;
      const interval = s | 0;
      const t = s - interval;
      const at = ((biased - TABLE_FIRST_BIASED_EXPONENT) * INTERVALS + interval) * (DEGREE + 1);
      values[i] = c[at] + t * (c[at + 1] + t * (c[at + 2] + t * (c[at + 3] + t * (c[at + 4] + t * (c[at + 5] + t * (c[at + 6] + t * c[at + 7]))))));
    }
  }
}

const BITS = new Float64Array(1);
const HIGH_WORD = new Uint32Array(BITS.buffer);
const HIGH_INDEX = new Uint8Array(Float64Array.of(1).buffer)[7] === 0x3f ? 1 : 0;
const INVERSE_POWERS = Float64Array.from({ length: 2048 }, (_, e) => Math.pow(2, 1023 - e));

/** Smallest and largest-plus-one v tabulated, and the biased double exponent of the first octave. */
const TABLE_LOWEST_V = Math.pow(2, LOWEST_OCTAVE);
const TABLE_HIGHEST_V = Math.pow(2, LOWEST_OCTAVE + OCTAVES);
const TABLE_FIRST_BIASED_EXPONENT = LOWEST_OCTAVE + 1023;

/**
 * Inverse of the Vandermonde matrix V[a][j] = (a + FIRST_NODE)^j: row j gives c_j from the
 * values at the nodes (Gaussian elimination with partial pivoting, done once).
 */
const MONOMIAL_FROM_VALUES = ((): Float64Array => {
  const n = DEGREE + 1;
  const a = new Float64Array(n * 2 * n);
  for (let r = 0; r < n; r++) {
    for (let j = 0; j < n; j++) a[r * 2 * n + j] = Math.pow(r + FIRST_NODE, j);
    a[r * 2 * n + n + r] = 1;
  }
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r * 2 * n + col]) > Math.abs(a[pivot * 2 * n + col])) pivot = r;
    for (let k = 0; k < 2 * n; k++) {
      const t = a[col * 2 * n + k]; a[col * 2 * n + k] = a[pivot * 2 * n + k]; a[pivot * 2 * n + k] = t;
    }
    const d = a[col * 2 * n + col];
    for (let k = 0; k < 2 * n; k++) a[col * 2 * n + k] /= d;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r * 2 * n + col];
      for (let k = 0; k < 2 * n; k++) a[r * 2 * n + k] -= f * a[col * 2 * n + k];
    }
  }
  // V c = values, so c = V^-1 values: V^-1[j][a] is at row j of the right half.
  const inverse = new Float64Array(n * n);
  for (let j = 0; j < n; j++) for (let k = 0; k < n; k++) inverse[j * n + k] = a[j * 2 * n + n + k];
  return inverse;
})();
