import { choleskyFactor, choleskySolveInPlace } from '../numeric/linearAlgebra/choleskyFactor.js';
import { SimdNormalEquations } from '../numeric/linearAlgebra/simdNormalEquations.js';

/**
 * chi^2 of a target image against a linear combination of basis images, minimised over the
 * amplitudes: weighted linear least squares by the normal equations (Gauss 1809; e.g. Press et
 * al. 2007, Numerical Recipes section 15.4), a = (B^T W B)^-1 B^T W d with W = diag(1 / sigma^2),
 * and chi^2 = sum_i w_i (d_i - (B a)_i)^2 summed from the residuals (not from d^T W d - b^T a,
 * which loses the small chi^2 of a near-perfect fit to cancellation). Only the used pixels count.
 * Buffers are owned by the instance and reused.
 */
export class LinearAmplitudeChiSquare {
  readonly amplitudeCount: number;
  /** Amplitudes of the last evaluation. */
  readonly amplitudes: Float64Array;
  private readonly used: Int32Array;
  private readonly target: Float64Array;
  private readonly inverseVariance: Float64Array;
  private readonly normal: Float64Array;
  /** The basis at the used pixels (basis k at packed[k * used.length + e]). */
  private readonly packed: Float64Array;
  private readonly equations = new SimdNormalEquations();

  /**
   * @param used row-major indices of the pixels that count
   * @param sigma the 1-sigma noise of the whole grid (indexed like the images)
   */
  constructor(used: Int32Array, sigma: ArrayLike<number>, amplitudeCount: number) {
    this.used = used;
    this.amplitudeCount = amplitudeCount;
    this.target = new Float64Array(used.length);
    this.inverseVariance = Float64Array.from(used, (p) => 1 / (sigma[p] * sigma[p]));
    this.normal = new Float64Array(amplitudeCount * amplitudeCount);
    this.amplitudes = new Float64Array(amplitudeCount);
    this.packed = new Float64Array(amplitudeCount * used.length);
  }

  /** Sets the target image (whole grid, row-major); only the used pixels are read. */
  setTarget(image: ArrayLike<number>): void {
    for (let e = 0; e < this.used.length; e++) this.target[e] = image[this.used[e]];
  }

  /**
   * The least-squares chi^2 for basis images stored as basis[k * pixelCount + p] over the whole
   * grid; +Infinity when the normal matrix is not positive definite (a basis empty in the used pixels).
   */
  chiSquare(basis: Float64Array, pixelCount: number): number {
    const k = this.amplitudeCount;
    const used = this.used;
    const n = used.length;
    const w = this.inverseVariance;
    const d = this.target;
    const a = this.normal;
    const x = this.amplitudes;
    this.pack(basis, pixelCount);
    this.equations.assemble(this.packed, k, n, w, d, a, x);
    if (Number.isNaN(choleskyFactor(a, k))) return Number.POSITIVE_INFINITY;
    choleskySolveInPlace(a, k, x);
    let chi2 = 0;
    for (let e = 0; e < n; e++) {
      let model = 0;
      for (let p = 0; p < k; p++) model += x[p] * basis[p * pixelCount + used[e]];
      const r = d[e] - model;
      chi2 += w[e] * r * r;
    }
    return chi2;
  }

  /** The basis at the used pixels into `packed`. */
  private pack(basis: Float64Array, pixelCount: number): void {
    const used = this.used, n = used.length, packed = this.packed;
    for (let p = 0; p < this.amplitudeCount; p++) {
      for (let e = 0; e < n; e++) packed[p * n + e] = basis[p * pixelCount + used[e]];
    }
  }
}
