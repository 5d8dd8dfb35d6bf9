/**
 * The normal equations of weighted linear least squares (Gauss 1809; e.g. Press et al. 2007,
 * Numerical Recipes sec. 15.4) for the model sum_k a_k B_k of data d with weights w (inverse
 * variances) over n points: A = B^T W B into the lower triangle of `normal` (k x k, row-major,
 * entry (p, q) for q <= p) and b = B^T W d into `rhs`. Basis k occupies basis[k * n .. k * n + n).
 * `weighted` is n values of scratch. Allocates nothing.
 *
 * b is summed as the last row of the lower triangle of the Gram matrix of [B; d]: b_q =
 * sum_i (d_i w_i) B_q[i]. Each entry is summed as the WebAssembly twin's two lanes do (its
 * fast twin, SimdNormalEquations in simdNormalEquations.ts; test/numeric/linearAlgebra compares
 * the two bit for bit): the even points in order, the odd points in order, then the two sums
 * added. Four entries of a row are summed in one pass.
 */
export function weightedNormalEquations(
  basis: Float64Array, k: number, n: number, w: Float64Array, d: Float64Array,
  normal: Float64Array, rhs: Float64Array, weighted: Float64Array,
): void {
  for (let p = 0; p <= k; p++) {
    const source = p < k ? basis : d;
    const rowP = p < k ? p * n : 0;
    for (let i = 0; i < n; i++) weighted[i] = source[rowP + i] * w[i];
    const out = p < k ? normal : rhs;
    const at = p < k ? p * k : 0;
    const last = Math.min(p, k - 1);
    let q = 0;
    for (; q + 3 <= last; q += 4) fourDots(weighted, basis, q * n, n, out, at + q);
    for (; q <= last; q++) out[at + q] = twoLaneDot(weighted, basis, q * n, n);
  }
}

/** sum_i weighted[i] basis[rowQ + i]: the even i in order, the odd i in order, then the two added. */
function twoLaneDot(weighted: Float64Array, basis: Float64Array, rowQ: number, n: number): number {
  let even = 0, odd = 0;
  let i = 0;
  for (; i + 1 < n; i += 2) {
    even += weighted[i] * basis[rowQ + i];
    odd += weighted[i + 1] * basis[rowQ + i + 1];
  }
  if (i < n) even += weighted[i] * basis[rowQ + i];
  return even + odd;
}

/** out[at + j] = twoLaneDot of weighted with basis row rowQ + j n, for j = 0..3, in one pass. */
function fourDots(weighted: Float64Array, basis: Float64Array, rowQ: number, n: number, out: Float64Array, at: number): void {
  let e0 = 0, e1 = 0, e2 = 0, e3 = 0, o0 = 0, o1 = 0, o2 = 0, o3 = 0;
  const r1 = rowQ + n, r2 = r1 + n, r3 = r2 + n;
  let i = 0;
  for (; i + 1 < n; i += 2) {
    const v = weighted[i], u = weighted[i + 1];
    e0 += v * basis[rowQ + i];
    o0 += u * basis[rowQ + i + 1];
    e1 += v * basis[r1 + i];
    o1 += u * basis[r1 + i + 1];
    e2 += v * basis[r2 + i];
    o2 += u * basis[r2 + i + 1];
    e3 += v * basis[r3 + i];
    o3 += u * basis[r3 + i + 1];
  }
  if (i < n) {
    const v = weighted[i];
    e0 += v * basis[rowQ + i];
    e1 += v * basis[r1 + i];
    e2 += v * basis[r2 + i];
    e3 += v * basis[r3 + i];
  }
  out[at] = e0 + o0;
  out[at + 1] = e1 + o1;
  out[at + 2] = e2 + o2;
  out[at + 3] = e3 + o3;
}
