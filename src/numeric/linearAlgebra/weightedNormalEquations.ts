/**
 * The normal equations of weighted linear least squares (Gauss 1809; e.g. Press et al. 2007,
 * Numerical Recipes sec. 15.4) for the model sum_k a_k B_k of data d with weights w (inverse
 * variances) over n points: A = B^T W B into the lower triangle of `normal` (k x k, row-major,
 * entry (p, q) for q <= p) and b = B^T W d into `rhs`. Basis k occupies basis[k * n .. k * n + n).
 * `weighted` is n values of scratch. Allocates nothing. Four entries of a row are summed in one
 * pass (each still in order over the points, so the sums are those of one entry at a time).
 */
export function weightedNormalEquations(
  basis: Float64Array, k: number, n: number, w: Float64Array, d: Float64Array,
  normal: Float64Array, rhs: Float64Array, weighted: Float64Array,
): void {
  for (let p = 0; p < k; p++) {
    const rowP = p * n;
    let dot = 0;
    for (let i = 0; i < n; i++) {
      const v = basis[rowP + i] * w[i];
      weighted[i] = v;
      dot += v * d[i];
    }
    rhs[p] = dot;
    let q = 0;
    for (; q + 3 <= p; q += 4) fourDots(weighted, basis, q * n, n, normal, p * k + q);
    for (; q <= p; q++) {
      const rowQ = q * n;
      let s = 0;
      for (let i = 0; i < n; i++) s += weighted[i] * basis[rowQ + i];
      normal[p * k + q] = s;
    }
  }
}

/** out[at + j] = sum_i weighted[i] basis[rowQ + j n + i] for j = 0..3, each summed in order of i. */
function fourDots(weighted: Float64Array, basis: Float64Array, rowQ: number, n: number, out: Float64Array, at: number): void {
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
  const r1 = rowQ + n, r2 = r1 + n, r3 = r2 + n;
  for (let i = 0; i < n; i++) {
    const v = weighted[i];
    s0 += v * basis[rowQ + i];
    s1 += v * basis[r1 + i];
    s2 += v * basis[r2 + i];
    s3 += v * basis[r3 + i];
  }
  out[at] = s0;
  out[at + 1] = s1;
  out[at + 2] = s2;
  out[at + 3] = s3;
}
