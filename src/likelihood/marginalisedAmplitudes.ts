import { choleskyFactor, choleskySolveInPlace } from '../numeric/linearAlgebra/choleskyFactor.js';
import { SimdNormalEquations } from '../numeric/linearAlgebra/simdNormalEquations.js';

/**
 * Gaussian pixel likelihood with the linear light amplitudes integrated out analytically.
 * Data d_i with independent Gaussian noise sigma_i over the N used pixels; model
 * m = sum_k a_k B_k; prior a_k ~ Normal(0, s^2) independently. The evidence of the amplitudes,
 * integral of N(d | B a, C) N(a | 0, s^2 I) da, is (e.g. MacKay 2003, ch. 28; Bishop 2006 eq. 3.86):
 *   ln L = -1/2 sum ln(2 pi sigma_i^2) - 1/2 d^T C^-1 d + 1/2 b^T A^-1 b - 1/2 ln det A - (K/2) ln s^2
 * with A = B^T C^-1 B + I / s^2 and b = B^T C^-1 d. Buffers are owned by the instance and reused.
 */
export class MarginalisedAmplitudes {
  readonly pixelCount: number;
  readonly amplitudeCount: number;
  private readonly data: Float64Array;
  private readonly inverseVariance: Float64Array;
  private readonly constantTerm: number;
  private readonly dataTerm: number;
  private readonly priorPrecision: number;
  private readonly priorLogTerm: number;
  private readonly normal: Float64Array;
  private readonly rhs: Float64Array;
  private readonly equations = new SimdNormalEquations();
  /** Posterior-mean amplitudes of the last evaluation (A^-1 b). */
  readonly amplitudes: Float64Array;

  /**
   * @param data the N used pixels' values
   * @param sigma their 1-sigma noise (strictly positive; checked by the data loader)
   * @param amplitudeCount K, the number of basis images
   * @param priorSigma s, the prior width of every amplitude
   */
  constructor(data: Float64Array, sigma: Float64Array, amplitudeCount: number, priorSigma: number) {
    const n = data.length;
    this.pixelCount = n;
    this.amplitudeCount = amplitudeCount;
    this.data = data;
    this.inverseVariance = new Float64Array(n);
    let constantTerm = 0;
    let dataTerm = 0;
    for (let i = 0; i < n; i++) {
      const w = 1 / (sigma[i] * sigma[i]);
      this.inverseVariance[i] = w;
      constantTerm += Math.log(2 * Math.PI * sigma[i] * sigma[i]);
      dataTerm += data[i] * data[i] * w;
    }
    this.constantTerm = -0.5 * constantTerm;
    this.dataTerm = -0.5 * dataTerm;
    this.priorPrecision = 1 / (priorSigma * priorSigma);
    this.priorLogTerm = -0.5 * amplitudeCount * Math.log(priorSigma * priorSigma);
    this.normal = new Float64Array(amplitudeCount * amplitudeCount);
    this.rhs = new Float64Array(amplitudeCount);
    this.amplitudes = new Float64Array(amplitudeCount);
  }

  /**
   * ln L for basis images `basis` (basis k at basis[k * N + i] for used pixel i).
   * Returns -Infinity when the normal matrix is not positive definite.
   */
  logLikelihood(basis: Float64Array): number {
    const k = this.amplitudeCount;
    const a = this.normal;
    const b = this.rhs;
    this.equations.assemble(basis, k, this.pixelCount, this.inverseVariance, this.data, a, b);
    for (let p = 0; p < k; p++) a[p * k + p] += this.priorPrecision;
    const logDet = choleskyFactor(a, k);
    if (Number.isNaN(logDet)) return Number.NEGATIVE_INFINITY;
    const x = this.amplitudes;
    for (let p = 0; p < k; p++) x[p] = b[p];
    choleskySolveInPlace(a, k, x);
    let quadratic = 0;
    for (let p = 0; p < k; p++) quadratic += b[p] * x[p];
    return this.constantTerm + this.dataTerm + 0.5 * quadratic - 0.5 * logDet + this.priorLogTerm;
  }
}
