/**
 * The normal equations of weighted linear least squares (Gauss 1809; e.g. Press et al. 2007,
 * Numerical Recipes sec. 15.4) for the model sum_k a_k B_k of data d with weights w (inverse
 * variances) over n points: A = B^T W B into the lower triangle of `normal` (k x k, row-major,
 * entry (p, q) for q <= p) and b = B^T W d into `rhs`. Basis k occupies basis[k * n .. k * n + n).
 * `weighted` is n values of scratch. Allocates nothing.
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
    for (let q = 0; q <= p; q++) {
      const rowQ = q * n;
      let s = 0;
      for (let i = 0; i < n; i++) s += weighted[i] * basis[rowQ + i];
      normal[p * k + q] = s;
    }
  }
}
