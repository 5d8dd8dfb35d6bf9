import { HERMITE_BLOCK } from './hermiteBlock.js';

/**
 * Means of Cartesian shapelets (Refregier 2003, MNRAS 338, 35, eqs. 1-3) over one run of `run`
 * positions, for every basis (n1, n2) with n1 + n2 <= maxOrder: each the sum, in order, of
 * scale * a[aAt + n1 * HERMITE_BLOCK + i] * b[bAt + n2 * HERMITE_BLOCK + i] (the products
 * writeBasis stores), times inverseRun, into out[into + basis * stride] with
 * basis = basisOf[n1 * (maxOrder + 1) + n2]. The sums are a triangle of the small matrix product
 * of the two Hermite tables; it is walked two n1 rows by four n2 rows at a time, so each pass
 * over the run loads six values for eight products, with narrower passes at the end of each
 * pair of rows. The entries left, on the anti-diagonal n1 + n2 = maxOrder, go four to a pass: a
 * pass with one sum waits on each addition, one with four overlaps them. Every sum keeps its own
 * order of additions, so the result equals writeBasis followed by in-order sums bit for bit.
 * scale and inverseRun come in `factors` ([scale, inverseRun]), not as arguments: V8 boxes a
 * double passed to a call it does not inline, an allocation per run.
 */
export function shapeletRunMeans(
  a: Float64Array, aAt: number, b: Float64Array, bAt: number, maxOrder: number, basisOf: Int32Array,
  factors: Float64Array, run: number, out: Float64Array, into: number, stride: number,
): void {
  const orderCount = maxOrder + 1;
  for (let n1 = 0; n1 + 1 <= maxOrder; n1 += 2) {
    // Rows n1 and n1 + 1 share n2 = 0..maxOrder - n1 - 1 (row n1's last entry is on the
    // anti-diagonal n1 + n2 = maxOrder, summed below).
    const shared = maxOrder - n1;
    const row0 = aAt + n1 * HERMITE_BLOCK, row1 = row0 + HERMITE_BLOCK;
    const basis0 = n1 * orderCount, basis1 = basis0 + orderCount;
    let n2 = 0;
    for (; n2 + 4 <= shared; n2 += 4) {
      twoByFour(a, row0, row1, b, bAt + n2 * HERMITE_BLOCK, factors, run, basisOf, basis0 + n2, basis1 + n2, out, into, stride);
    }
    if (n2 + 2 <= shared) {
      const c0 = bAt + n2 * HERMITE_BLOCK, c1 = c0 + HERMITE_BLOCK;
      fourProducts(
        a, row0, row0, row1, row1, b, c0, c1, c0, c1, factors, run,
        basisOf[basis0 + n2], basisOf[basis0 + n2 + 1], basisOf[basis1 + n2], basisOf[basis1 + n2 + 1], out, into, stride,
      );
      n2 += 2;
    }
    if (n2 < shared) {
      twoByOne(a, row0, row1, b, bAt + n2 * HERMITE_BLOCK, factors, run, basisOf[basis0 + n2], basisOf[basis1 + n2], out, into, stride);
    }
  }
  // The anti-diagonal entries (n1, maxOrder - n1) of even n1, four at a time.
  let n1 = 0;
  for (; n1 + 6 <= maxOrder; n1 += 8) {
    const n2 = maxOrder - n1;
    const a0 = aAt + n1 * HERMITE_BLOCK, b0 = bAt + n2 * HERMITE_BLOCK, step = 2 * HERMITE_BLOCK;
    fourProducts(
      a, a0, a0 + step, a0 + 2 * step, a0 + 3 * step, b, b0, b0 - step, b0 - 2 * step, b0 - 3 * step, factors, run,
      basisOf[n1 * orderCount + n2], basisOf[(n1 + 2) * orderCount + n2 - 2], basisOf[(n1 + 4) * orderCount + n2 - 4],
      basisOf[(n1 + 6) * orderCount + n2 - 6], out, into, stride,
    );
  }
  for (; n1 <= maxOrder; n1 += 2) {
    const n2 = maxOrder - n1;
    oneByOne(a, aAt + n1 * HERMITE_BLOCK, b, bAt + n2 * HERMITE_BLOCK, factors, run, basisOf[n1 * orderCount + n2], out, into, stride);
  }
}

/** Sums of rows a0, a1 (of a) against the four consecutive rows of b from b0. */
function twoByFour(
  a: Float64Array, a0: number, a1: number, b: Float64Array, b0: number, factors: Float64Array, run: number,
  basisOf: Int32Array, at0: number, at1: number, out: Float64Array, into: number, stride: number,
): void {
  const scale = factors[0], inverseRun = factors[1];
  const b1 = b0 + HERMITE_BLOCK, b2 = b1 + HERMITE_BLOCK, b3 = b2 + HERMITE_BLOCK;
  let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s10 = 0, s11 = 0, s12 = 0, s13 = 0;
  for (let i = 0; i < run; i++) {
    const v0 = scale * a[a0 + i], v1 = scale * a[a1 + i];
    const c0 = b[b0 + i], c1 = b[b1 + i], c2 = b[b2 + i], c3 = b[b3 + i];
    s00 += v0 * c0;
    s01 += v0 * c1;
    s02 += v0 * c2;
    s03 += v0 * c3;
    s10 += v1 * c0;
    s11 += v1 * c1;
    s12 += v1 * c2;
    s13 += v1 * c3;
  }
  out[into + basisOf[at0] * stride] = s00 * inverseRun;
  out[into + basisOf[at0 + 1] * stride] = s01 * inverseRun;
  out[into + basisOf[at0 + 2] * stride] = s02 * inverseRun;
  out[into + basisOf[at0 + 3] * stride] = s03 * inverseRun;
  out[into + basisOf[at1] * stride] = s10 * inverseRun;
  out[into + basisOf[at1 + 1] * stride] = s11 * inverseRun;
  out[into + basisOf[at1 + 2] * stride] = s12 * inverseRun;
  out[into + basisOf[at1 + 3] * stride] = s13 * inverseRun;
}

/** Four sums of products of rows, a from a_j against b from b_j (j = 0..3), into bases k0..k3. */
function fourProducts(
  a: Float64Array, a0: number, a1: number, a2: number, a3: number,
  b: Float64Array, b0: number, b1: number, b2: number, b3: number, factors: Float64Array, run: number,
  k0: number, k1: number, k2: number, k3: number, out: Float64Array, into: number, stride: number,
): void {
  const scale = factors[0], inverseRun = factors[1];
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
  for (let i = 0; i < run; i++) {
    s0 += scale * a[a0 + i] * b[b0 + i];
    s1 += scale * a[a1 + i] * b[b1 + i];
    s2 += scale * a[a2 + i] * b[b2 + i];
    s3 += scale * a[a3 + i] * b[b3 + i];
  }
  out[into + k0 * stride] = s0 * inverseRun;
  out[into + k1 * stride] = s1 * inverseRun;
  out[into + k2 * stride] = s2 * inverseRun;
  out[into + k3 * stride] = s3 * inverseRun;
}

/** Sums of rows a0, a1 against row b0 of b, into bases k0 and k1. */
function twoByOne(
  a: Float64Array, a0: number, a1: number, b: Float64Array, b0: number, factors: Float64Array, run: number,
  k0: number, k1: number, out: Float64Array, into: number, stride: number,
): void {
  const scale = factors[0], inverseRun = factors[1];
  let s0 = 0, s1 = 0;
  for (let i = 0; i < run; i++) {
    const c = b[b0 + i];
    s0 += scale * a[a0 + i] * c;
    s1 += scale * a[a1 + i] * c;
  }
  out[into + k0 * stride] = s0 * inverseRun;
  out[into + k1 * stride] = s1 * inverseRun;
}

/** The sum of row a0 against row b0, into basis k. */
function oneByOne(
  a: Float64Array, a0: number, b: Float64Array, b0: number, factors: Float64Array, run: number,
  k: number, out: Float64Array, into: number, stride: number,
): void {
  const scale = factors[0], inverseRun = factors[1];
  let sum = 0;
  for (let i = 0; i < run; i++) sum += scale * a[a0 + i] * b[b0 + i];
  out[into + k * stride] = sum * inverseRun;
}
