/**
 * In-place Cholesky factorisation A = L L^T of a symmetric positive-definite d x d row-major matrix
 * (Cholesky-Banachiewicz order, Golub & Van Loan 2013, Algorithm 4.2.1). On success the lower
 * triangle holds L and the strict upper triangle is zeroed; returns false (matrix left partly
 * overwritten) if a pivot is not positive.
 */
export function choleskyFactor(matrix: Float64Array, dim: number): boolean {
  for (let i = 0; i < dim; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = matrix[i * dim + j];
      for (let k = 0; k < j; k++) sum -= matrix[i * dim + k] * matrix[j * dim + k];
      if (i === j) {
        if (!(sum > 0)) return false;
        matrix[i * dim + i] = Math.sqrt(sum);
      } else {
        matrix[i * dim + j] = sum / matrix[j * dim + j];
      }
    }
    for (let j = i + 1; j < dim; j++) matrix[i * dim + j] = 0;
  }
  return true;
}

/** Solves L y = b for lower-triangular row-major L by forward substitution; y may alias b. */
export function forwardSubstitute(lower: Float64Array, dim: number, b: ArrayLike<number>, y: Float64Array): void {
  for (let i = 0; i < dim; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= lower[i * dim + k] * y[k];
    y[i] = sum / lower[i * dim + i];
  }
}

/**
 * Cholesky factor of a covariance matrix that may be singular (too few or collinear points): adds
 * a ridge of relative size 1e-12, 1e-10, ... times the mean diagonal until the factorisation
 * succeeds (diagonal loading, common practice). `covariance` is overwritten by L.
 */
export function choleskyWithRidge(covariance: Float64Array, dim: number, scratch: Float64Array): void {
  scratch.set(covariance.subarray(0, dim * dim));
  if (choleskyFactor(covariance, dim)) return;
  let meanDiagonal = 0;
  for (let i = 0; i < dim; i++) meanDiagonal += scratch[i * dim + i];
  meanDiagonal = meanDiagonal > 0 ? meanDiagonal / dim : 1;
  for (let relative = 1e-12; relative <= 1; relative *= 100) {
    covariance.set(scratch.subarray(0, dim * dim));
    for (let i = 0; i < dim; i++) covariance[i * dim + i] += relative * meanDiagonal;
    if (choleskyFactor(covariance, dim)) return;
  }
  covariance.fill(0);
  for (let i = 0; i < dim; i++) covariance[i * dim + i] = Math.sqrt(meanDiagonal);
}
