import { HERMITE_BLOCK } from './hermiteBlock.js';

/**
 * Means of Cartesian shapelets (Refregier 2003, MNRAS 338, 35, eqs. 1-3) over one run of `run`
 * positions, for every basis (n1, n2) with n1 + n2 <= maxOrder: each the sum, in order, of
 * scale * a[aAt + n1 * HERMITE_BLOCK + i] * b[bAt + n2 * HERMITE_BLOCK + i] (the products
 * writeBasis stores), times inverseRun, into out[into + basis * stride] with
 * basis = basisOf[n1 * (maxOrder + 1) + n2]. The sums are a triangle of the small matrix product
 * of the two Hermite tables; it is walked two n1 rows by four n2 rows at a time, so each pass
 * over the run loads six values for eight products (the edges of the triangle in narrower
 * passes). Every sum keeps its own order of additions, so the result equals writeBasis followed
 * by in-order sums bit for bit.
 */
export function shapeletRunMeans(
  a: Float64Array, aAt: number, b: Float64Array, bAt: number, maxOrder: number, basisOf: Int32Array,
  scale: number, inverseRun: number, run: number, out: Float64Array, into: number, stride: number,
): void {
  const orderCount = maxOrder + 1;
  let n1 = 0;
  for (; n1 + 1 <= maxOrder; n1 += 2) {
    // Rows n1 and n1 + 1 share n2 = 0..maxOrder - n1 - 1; row n1 has n2 = maxOrder - n1 besides.
    const shared = maxOrder - n1;
    const row0 = aAt + n1 * HERMITE_BLOCK, row1 = row0 + HERMITE_BLOCK;
    const basis0 = n1 * orderCount, basis1 = basis0 + orderCount;
    let n2 = 0;
    for (; n2 + 4 <= shared; n2 += 4) {
      twoByFour(a, row0, row1, b, bAt + n2 * HERMITE_BLOCK, scale, run, basisOf, basis0 + n2, basis1 + n2, inverseRun, out, into, stride);
    }
    for (; n2 < shared; n2++) {
      twoByOne(a, row0, row1, b, bAt + n2 * HERMITE_BLOCK, scale, run, basisOf[basis0 + n2], basisOf[basis1 + n2], inverseRun, out, into, stride);
    }
    oneByOne(a, row0, b, bAt + shared * HERMITE_BLOCK, scale, run, basisOf[basis0 + shared], inverseRun, out, into, stride);
  }
  if (n1 === maxOrder) {
    oneByOne(a, aAt + n1 * HERMITE_BLOCK, b, bAt, scale, run, basisOf[n1 * orderCount], inverseRun, out, into, stride);
  }
}

/** Sums of rows a0, a1 (of a) against the four consecutive rows of b from b0. */
function twoByFour(
  a: Float64Array, a0: number, a1: number, b: Float64Array, b0: number, scale: number, run: number,
  basisOf: Int32Array, at0: number, at1: number, inverseRun: number, out: Float64Array, into: number, stride: number,
): void {
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

/** Sums of rows a0, a1 against row b0 of b, into bases k0 and k1. */
function twoByOne(
  a: Float64Array, a0: number, a1: number, b: Float64Array, b0: number, scale: number, run: number,
  k0: number, k1: number, inverseRun: number, out: Float64Array, into: number, stride: number,
): void {
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
  a: Float64Array, a0: number, b: Float64Array, b0: number, scale: number, run: number,
  k: number, inverseRun: number, out: Float64Array, into: number, stride: number,
): void {
  let sum = 0;
  for (let i = 0; i < run; i++) sum += scale * a[a0 + i] * b[b0 + i];
  out[into + k * stride] = sum * inverseRun;
}
