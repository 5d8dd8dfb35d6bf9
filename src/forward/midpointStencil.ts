/**
 * Weights w_k, k = -halfWidth..halfWidth, such that sum_k w_k g(k) equals the mean of g over the
 * supersampling-point midpoint rule on [-1/2, 1/2] (points (a + 1/2)/S - 1/2, a = 0..S-1) for
 * every polynomial g of degree <= 2 halfWidth: the moment conditions of an interpolatory
 * quadrature (Davis & Rabinowitz, Methods of Numerical Integration, 1984, sec. 2.5), solved here
 * by Gaussian elimination on the (2 halfWidth + 1)-square Vandermonde system. Used on a lattice of
 * pixel centres (node spacing one pixel), so that the tensor product of two such weight sets
 * predicts a pixel's S x S supersampled mean from its neighbours.
 */
export function midpointStencilWeights(supersampling: number, halfWidth: number): Float64Array {
  const n = 2 * halfWidth + 1;
  const matrix = new Float64Array(n * n);
  const rhs = new Float64Array(n);
  for (let d = 0; d < n; d++) {
    for (let k = -halfWidth; k <= halfWidth; k++) matrix[d * n + k + halfWidth] = k ** d;
    let moment = 0;
    for (let a = 0; a < supersampling; a++) moment += ((a + 0.5) / supersampling - 0.5) ** d;
    rhs[d] = moment / supersampling;
  }
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let row = col + 1; row < n; row++) if (Math.abs(matrix[row * n + col]) > Math.abs(matrix[pivot * n + col])) pivot = row;
    for (let k = 0; k < n; k++) {
      const t = matrix[col * n + k]; matrix[col * n + k] = matrix[pivot * n + k]; matrix[pivot * n + k] = t;
    }
    const t = rhs[col]; rhs[col] = rhs[pivot]; rhs[pivot] = t;
    for (let row = 0; row < n; row++) {
      if (row === col) continue;
      const factor = matrix[row * n + col] / matrix[col * n + col];
      for (let k = col; k < n; k++) matrix[row * n + k] -= factor * matrix[col * n + k];
      rhs[row] -= factor * rhs[col];
    }
  }
  const weights = new Float64Array(n);
  for (let k = 0; k < n; k++) weights[k] = rhs[k] / matrix[k * n + k];
  return weights;
}

/**
 * Richardson extrapolation of the midpoint rule (Richardson 1911; e.g. Press et al., Numerical
 * Recipes, sec. 4.3): for a smooth integrand the m x m midpoint mean is I + c / m^2 + O(m^-4), so
 * from the means at m1 < m2 the mean at `target` is I_m2 + (I_m2 - I_m1) * factor with
 * factor = (1/m2^2 - 1/target^2) / (1/m1^2 - 1/m2^2).
 */
export function richardsonFactor(m1: number, m2: number, target: number): number {
  return (1 / (m2 * m2) - 1 / (target * target)) / (1 / (m1 * m1) - 1 / (m2 * m2));
}
