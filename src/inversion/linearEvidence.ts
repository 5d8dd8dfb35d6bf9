import { EnvelopeCholesky } from '../numeric/sparse/envelopeCholesky.js';
import { envelopeInverseDiagonal } from '../numeric/sparse/envelopeInverseDiagonal.js';
import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import { MultifrontalCholesky } from '../numeric/sparse/multifrontalCholesky.js';
import { NestedDissection, type PlanePoints } from '../numeric/sparse/nestedDissection.js';
import { ReverseCuthillMcKee } from '../numeric/sparse/reverseCuthillMcKee.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';
import type { NormalMatrix } from './normalMatrix.js';

/**
 * Matrices whose stored fraction (2 nnz - n) / n^2 is at most this go to the multifrontal
 * Cholesky, denser ones to the envelope Cholesky (the commit that set it has the measurements:
 * the nested dissection saves flops only where the coupling is short against the mesh).
 */
export const MULTIFRONTAL_DENSITY = 0.12;

/** Which sparse Cholesky factors A: chosen per call by MULTIFRONTAL_DENSITY, or forced (tests, benchmarks). */
export type LinearEvidenceFactorisation = 'automatic' | 'envelope' | 'multifrontal';

/**
 * The evidence of a linear Gaussian model with its unknowns integrated out: data d with inverse
 * variances w_i at N pixels, unknowns x with prior N(0, P^-1), model R x. With A = P + R^T W R
 * and b = R^T W d (NormalMatrix),
 *   ln Z = -1/2 sum_i ln(2 pi / w_i) - 1/2 d^T W d + 1/2 b^T A^-1 b - 1/2 ln det A + 1/2 ln det P
 * (the Gaussian integral over x; e.g. MacKay 2003, ch. 28; Suyu et al. 2006 give it for a
 * regularised source). A is factored, with the dense amplitude rows last, either by the envelope
 * Cholesky in reverse Cuthill-McKee order or by the multifrontal Cholesky in nested-dissection
 * order (the unknowns' plane coordinates guide it); both give ln Z to rounding. The
 * multifrontal ordering and analysis are kept while A's pattern stays the same. The caller
 * passes ln det P. Buffers are reused.
 */
export class LinearEvidence {
  private readonly ordering = new ReverseCuthillMcKee();
  private readonly envelope = new EnvelopeCholesky();
  private readonly dissection = new NestedDissection();
  private readonly multifrontal = new MultifrontalCholesky();
  private order = new Int32Array(0);
  private last = new Int32Array(0);
  private usedMultifrontal = false;
  /** The coordinates and dense count of the last multifrontal analysis (pointCount -1: none given). */
  private pointX = new Float64Array(0);
  private pointY = new Float64Array(0);
  private pointCount = -2;
  private analysedLast = -1;
  /** A^-1 b of the last successful evaluation (the posterior mean of the unknowns). */
  solution = new Float64Array(0);
  private readonly constantTerm: number;

  /** `data` and `inverseVariance` at the N pixels fix the first two terms. */
  constructor(data: Float64Array, inverseVariance: Float64Array, readonly factorisation: LinearEvidenceFactorisation = 'automatic') {
    let constant = 0;
    for (let e = 0; e < data.length; e++) constant += Math.log((2 * Math.PI) / inverseVariance[e]) + data[e] * data[e] * inverseVariance[e];
    this.constantTerm = -0.5 * constant;
  }

  /** Order of A in the last evaluation. */
  get size(): number {
    return this.usedMultifrontal ? this.multifrontal.size : this.envelope.size;
  }

  /** Whether the last evaluation factored A with the multifrontal Cholesky. */
  get lastUsedMultifrontal(): boolean {
    return this.usedMultifrontal;
  }

  /**
   * ln Z for the normal matrix (its last `lastCount` rows ordered last), or NaN when A is not
   * positive definite. `points`: plane coordinates of the first unknowns (source cells), or null.
   */
  evaluate(normal: NormalMatrix, lastCount: number, logDetPrior: number, points: PlanePoints | null = null): number {
    const size = normal.size;
    this.last = ensureInt32Capacity(this.last, Math.max(1, lastCount));
    for (let a = 0; a < lastCount; a++) this.last[a] = size - lastCount + a;
    this.usedMultifrontal = this.chooseMultifrontal(normal);
    const logDetA = this.usedMultifrontal ? this.factorMultifrontal(normal, lastCount, points) : this.factorEnvelope(normal, lastCount);
    if (Number.isNaN(logDetA)) return Number.NaN;
    this.solution = ensureFloat64Capacity(this.solution, size);
    if (this.usedMultifrontal) this.multifrontal.solve(normal.rhs, this.solution);
    else this.envelope.solve(normal.rhs, this.solution);
    let quadratic = 0;
    for (let i = 0; i < size; i++) quadratic += normal.rhs[i] * this.solution[i];
    return this.constantTerm + 0.5 * quadratic - 0.5 * logDetA + 0.5 * logDetPrior;
  }

  /**
   * The diagonal of A^-1 of the last successful evaluation into out[0 .. size - 1] (posterior
   * variances; Takahashi recurrences on the factor used). It allocates: once per run, for reports.
   */
  inverseDiagonal(out: Float64Array): void {
    if (this.usedMultifrontal) this.multifrontal.inverseDiagonal(out);
    else envelopeInverseDiagonal(this.envelope, out);
  }

  private chooseMultifrontal(normal: SymmetricCsr): boolean {
    if (this.factorisation !== 'automatic') return this.factorisation === 'multifrontal';
    const n = normal.size;
    return 2 * normal.rowStart[n] - n <= MULTIFRONTAL_DENSITY * n * n;
  }

  private factorEnvelope(normal: NormalMatrix, lastCount: number): number {
    this.order = ensureInt32Capacity(this.order, normal.size);
    const order = this.ordering.order(normal, this.order, this.last.subarray(0, lastCount));
    this.envelope.analyse(normal, order);
    return this.envelope.factor(normal);
  }

  /**
   * Orders and analyses only when the pattern, the coordinates or the dense count changed, so
   * the ordering stays a function of those alone (a resumed run factors as the first did).
   */
  private factorMultifrontal(normal: NormalMatrix, lastCount: number, points: PlanePoints | null): number {
    if (!(this.multifrontal.isAnalysedFor(normal) && lastCount === this.analysedLast && this.samePoints(points))) {
      this.order = ensureInt32Capacity(this.order, normal.size);
      const tree = this.dissection.order(normal, points, this.last.subarray(0, lastCount), this.order);
      this.multifrontal.analyse(normal, this.order, tree);
      this.keepPoints(points);
      this.analysedLast = lastCount;
    }
    return this.multifrontal.factor(normal);
  }

  private samePoints(points: PlanePoints | null): boolean {
    const count = points === null ? -1 : points.count;
    if (count !== this.pointCount) return false;
    if (points === null) return true;
    return sameCoordinates(points.x, this.pointX, count) && sameCoordinates(points.y, this.pointY, count);
  }

  private keepPoints(points: PlanePoints | null): void {
    this.pointCount = points === null ? -1 : points.count;
    if (points === null) return;
    this.pointX = ensureFloat64Capacity(this.pointX, points.count);
    this.pointY = ensureFloat64Capacity(this.pointY, points.count);
    for (let v = 0; v < points.count; v++) this.pointX[v] = points.x[v];
    for (let v = 0; v < points.count; v++) this.pointY[v] = points.y[v];
  }
}

function sameCoordinates(a: ArrayLike<number>, b: Float64Array, count: number): boolean {
  for (let v = 0; v < count; v++) if (a[v] !== b[v]) return false;
  return true;
}
