/**
 * In-place Cholesky factorisation A = L L^T of a symmetric positive-definite k x k matrix
 * stored row-major in `a` (the lower triangle is overwritten by L; the upper is not read).
 * Returns ln det A = 2 sum ln L_ii, or NaN when A is not positive definite
 * (Golub & Van Loan 2013, Algorithm 4.2.1).
 */
export function choleskyFactor(a: Float64Array, k: number): number {
  let logDet = 0;
  for (let j = 0; j < k; j++) {
    let diagonal = a[j * k + j];
    for (let m = 0; m < j; m++) diagonal -= a[j * k + m] * a[j * k + m];
    if (!(diagonal > 0)) return Number.NaN;
    const root = Math.sqrt(diagonal);
    a[j * k + j] = root;
    logDet += 2 * Math.log(root);
    for (let i = j + 1; i < k; i++) {
      let s = a[i * k + j];
      for (let m = 0; m < j; m++) s -= a[i * k + m] * a[j * k + m];
      a[i * k + j] = s / root;
    }
  }
  return logDet;
}

/**
 * Solves L L^T x = b in place in `b`, with L from choleskyFactor (forward then back
 * substitution; Golub & Van Loan 2013, section 4.2).
 */
export function choleskySolveInPlace(l: Float64Array, k: number, b: Float64Array): void {
  forwardSubstitute(l, k, b, b);
  for (let i = k - 1; i >= 0; i--) {
    let s = b[i];
    for (let m = i + 1; m < k; m++) s -= l[m * k + i] * b[m];
    b[i] = s / l[i * k + i];
  }
}

/** Solves L y = b for lower-triangular row-major L by forward substitution (Golub & Van Loan 2013, Algorithm 3.1.1); y may alias b. */
export function forwardSubstitute(lower: Float64Array, k: number, b: ArrayLike<number>, y: Float64Array): void {
  for (let i = 0; i < k; i++) {
    let s = b[i];
    for (let m = 0; m < i; m++) s -= lower[i * k + m] * y[m];
    y[i] = s / lower[i * k + i];
  }
}
