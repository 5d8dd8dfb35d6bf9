import { dot } from './dot.js';
import { ensureFloat64Capacity } from './ensureCapacity.js';
import { partialCholesky } from './partialCholesky.js';
import { ensureSimdFloat64Capacity } from './simdTileKernels.js';
import type { SymmetricCsr } from './symmetricCsr.js';

/**
 * Cholesky factorisation A = L L^T of a symmetric sparse matrix held as one dense front: the
 * lower triangle is scattered into a zeroed column-major n x n array and factored by the blocked
 * partialCholesky (its SIMD tiles), with no ordering, no analysis and no assembly tree. Where the
 * factor of a sparse method would be (nearly) full anyway, as for the normal matrix of a source
 * mesh whose cells the PSF couples across the whole source, this does the same arithmetic
 * without the bookkeeping. The array is reused across calls; a call allocates nothing once it
 * has grown to the largest n.
 */
export class DenseCholesky {
  private a = new Float64Array(0);
  private n = 0;
  private factored = false;
  /** y = L^-1 b of the last forwardSolve. */
  private y = new Float64Array(0);

  /** Order of the last factorisation. */
  get size(): number {
    return this.n;
  }

  /** Whether the last factor() succeeded (solve and inverseDiagonal need it). */
  get isFactored(): boolean {
    return this.factored;
  }

  /** ln det A, or NaN at the first pivot that is not positive. */
  factor(matrix: SymmetricCsr): number {
    const n = matrix.size;
    this.n = n;
    this.a = ensureSimdFloat64Capacity(this.a, n * n);
    const a = this.a;
    a.fill(0, 0, n * n);
    const { rowStart, column, value } = matrix;
    // Entry (i, j), j <= i, of the lower triangle at column-major j n + i.
    for (let i = 0; i < n; i++) {
      for (let p = rowStart[i]; p < rowStart[i + 1]; p++) a[column[p] * n + i] = value[p];
    }
    const logDet = partialCholesky(a, n, n, n);
    this.factored = !Number.isNaN(logDet);
    return logDet;
  }

  /**
   * x = A^-1 b by forward (L y = b, column by column) and back (L^T x = y, column dot products)
   * substitution (Golub & Van Loan 2013, Algorithms 3.1.3 and 3.1.4); x may alias b.
   */
  solve(b: ArrayLike<number>, x: Float64Array): void {
    this.forwardSolve(b);
    this.backSolve(x);
  }

  /**
   * The first half of solve: y = L^-1 b (L y = b, column by column), kept for backSolve; returns
   * y^T y, which is b^T A^-1 b, all a Gaussian integral's exponent needs.
   */
  forwardSolve(b: ArrayLike<number>): number {
    if (!this.factored) throw new RangeError('DenseCholesky.solve: no successful factorisation');
    const n = this.n, a = this.a;
    this.y = ensureFloat64Capacity(this.y, n);
    const y = this.y;
    for (let i = 0; i < n; i++) y[i] = b[i];
    for (let j = 0; j < n; j++) {
      const c = j * n;
      const yj = y[j] / a[c + j];
      y[j] = yj;
      for (let i = j + 1; i < n; i++) y[i] -= a[c + i] * yj;
    }
    return dot(y, 0, y, 0, n);
  }

  /** The second half of solve: x = A^-1 b (L^T x = y, column dot products) from the y of the last forwardSolve. */
  backSolve(x: Float64Array): void {
    if (!this.factored) throw new RangeError('DenseCholesky.solve: no successful factorisation');
    const n = this.n, a = this.a, y = this.y;
    for (let i = 0; i < n; i++) x[i] = y[i];
    for (let j = n - 1; j >= 0; j--) {
      const c = j * n;
      let s = x[j];
      for (let i = j + 1; i < n; i++) s -= a[c + i] * x[i];
      x[j] = s / a[c + j];
    }
  }

  /**
   * The diagonal of A^-1 into out[0 .. n - 1]: with A^-1 = L^-T L^-1, (A^-1)_jj is the sum of
   * squares of column j of L^-1, each column solved from L z = e_j. O(n^3); it allocates: once
   * per run, for reports.
   */
  inverseDiagonal(out: Float64Array): void {
    if (!this.factored) throw new RangeError('DenseCholesky.inverseDiagonal: no successful factorisation');
    const n = this.n, a = this.a;
    const z = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      z.fill(0, j);
      z[j] = 1;
      let sum = 0;
      for (let k = j; k < n; k++) {
        const c = k * n;
        const zk = z[k] / a[c + k];
        sum += zk * zk;
        for (let i = k + 1; i < n; i++) z[i] -= a[c + i] * zk;
      }
      out[j] = sum;
    }
  }
}
