import { choleskyFactor } from './choleskyFactor.js';

/**
 * Cholesky factor of a covariance matrix that may be singular (too few or collinear points): adds
 * a ridge of relative size 1e-12, 1e-10, ... times the mean diagonal until the factorisation
 * succeeds (diagonal loading, common practice). `covariance` (d x d, row-major) is overwritten by
 * L with its strict upper triangle zeroed; `scratch` holds d x d values.
 */
export function choleskyWithRidge(covariance: Float64Array, dim: number, scratch: Float64Array): void {
  scratch.set(covariance.subarray(0, dim * dim));
  if (factorLower(covariance, dim)) return;
  let meanDiagonal = 0;
  for (let i = 0; i < dim; i++) meanDiagonal += scratch[i * dim + i];
  meanDiagonal = meanDiagonal > 0 ? meanDiagonal / dim : 1;
  for (let relative = 1e-12; relative <= 1; relative *= 100) {
    covariance.set(scratch.subarray(0, dim * dim));
    for (let i = 0; i < dim; i++) covariance[i * dim + i] += relative * meanDiagonal;
    if (factorLower(covariance, dim)) return;
  }
  covariance.fill(0);
  for (let i = 0; i < dim; i++) covariance[i * dim + i] = Math.sqrt(meanDiagonal);
}

/** choleskyFactor, then the strict upper triangle zeroed; false when not positive definite. */
function factorLower(matrix: Float64Array, dim: number): boolean {
  if (Number.isNaN(choleskyFactor(matrix, dim))) return false;
  for (let i = 0; i < dim; i++) for (let j = i + 1; j < dim; j++) matrix[i * dim + j] = 0;
  return true;
}
