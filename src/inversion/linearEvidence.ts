import { EnvelopeCholesky } from '../numeric/sparse/envelopeCholesky.js';
import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import { ReverseCuthillMcKee } from '../numeric/sparse/reverseCuthillMcKee.js';
import type { NormalMatrix } from './normalMatrix.js';

/**
 * The evidence of a linear Gaussian model with its unknowns integrated out: data d with inverse
 * variances w_i at N pixels, unknowns x with prior N(0, P^-1), model R x. With A = P + R^T W R
 * and b = R^T W d (NormalMatrix),
 *   ln Z = -1/2 sum_i ln(2 pi / w_i) - 1/2 d^T W d + 1/2 b^T A^-1 b - 1/2 ln det A + 1/2 ln det P
 * (the Gaussian integral over x; e.g. MacKay 2003, ch. 28; Suyu et al. 2006 give it for a
 * regularised source). A is factored by the sparse envelope Cholesky in reverse Cuthill-McKee
 * order with the dense amplitude rows last; the caller passes ln det P. Buffers are reused.
 */
export class LinearEvidence {
  private readonly ordering = new ReverseCuthillMcKee();
  readonly cholesky = new EnvelopeCholesky();
  private order = new Int32Array(0);
  private last = new Int32Array(0);
  /** A^-1 b of the last successful evaluation (the posterior mean of the unknowns). */
  solution = new Float64Array(0);
  private readonly constantTerm: number;

  /** `data` and `inverseVariance` at the N pixels fix the first two terms. */
  constructor(data: Float64Array, inverseVariance: Float64Array) {
    let constant = 0;
    for (let e = 0; e < data.length; e++) constant += Math.log((2 * Math.PI) / inverseVariance[e]) + data[e] * data[e] * inverseVariance[e];
    this.constantTerm = -0.5 * constant;
  }

  /**
   * ln Z for the normal matrix (its last `lastCount` rows ordered last), or NaN when A is not
   * positive definite.
   */
  evaluate(normal: NormalMatrix, lastCount: number, logDetPrior: number): number {
    const size = normal.size;
    this.order = ensureInt32Capacity(this.order, size);
    this.last = ensureInt32Capacity(this.last, Math.max(1, lastCount));
    for (let a = 0; a < lastCount; a++) this.last[a] = size - lastCount + a;
    const order = this.ordering.order(normal, this.order, this.last.subarray(0, lastCount));
    this.cholesky.analyse(normal, order);
    const logDetA = this.cholesky.factor(normal);
    if (Number.isNaN(logDetA)) return Number.NaN;
    this.solution = ensureFloat64Capacity(this.solution, size);
    this.cholesky.solve(normal.rhs, this.solution);
    let quadratic = 0;
    for (let i = 0; i < size; i++) quadratic += normal.rhs[i] * this.solution[i];
    return this.constantTerm + 0.5 * quadratic - 0.5 * logDetA + 0.5 * logDetPrior;
  }
}
