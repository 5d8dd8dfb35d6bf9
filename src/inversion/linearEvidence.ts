import { EnvelopeCholesky } from '../numeric/sparse/envelopeCholesky.js';
import { DenseCholesky } from '../numeric/sparse/denseCholesky.js';
import { envelopeInverseDiagonal } from '../numeric/sparse/envelopeInverseDiagonal.js';
import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import { MultifrontalCholesky } from '../numeric/sparse/multifrontalCholesky.js';
import { NestedDissection, type PlanePoints } from '../numeric/sparse/nestedDissection.js';
import { PrincipalAxisOrder } from '../numeric/sparse/principalAxisOrder.js';
import { ReverseCuthillMcKee } from '../numeric/sparse/reverseCuthillMcKee.js';
import { SupernodeChain } from '../numeric/sparse/supernodeChain.js';
import type { SupernodeTree } from '../numeric/sparse/supernodeTree.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';
import type { NormalMatrix } from './normalMatrix.js';

/**
 * Matrices whose stored fraction (2 nnz - n) / n^2 is at most this are ordered by nested
 * dissection, denser ones by reverse Cuthill-McKee (the commit that set it has the
 * measurements: the dissection saves work only where the coupling is short against the mesh).
 */
export const NESTED_DISSECTION_DENSITY = 0.12;

/**
 * Matrices whose stored fraction is at least this are factored as one dense front: their factor
 * is nearly full whatever the ordering, and the sparse methods' bookkeeping then costs more than
 * it saves. Measured on the pixelated demo's mock (one thread, 15 repeats, best quartile): the
 * dense front and the profile chain break even near 0.42 (1,000 cells at 60% on the arcs, 18.7
 * against 19.2 ms; 1,500 cells at 90%, fraction 0.40, 59.9 against 60.9 ms); at 0.21 the chain
 * takes 9.7 ms and the front 18.1, at 0.70 (the demo's 600 cells) 8.2 and 5.0.
 */
export const DENSE_FRONT_DENSITY = 0.45;

/**
 * How A is factored: `dense` (one dense front, DenseCholesky), `nestedDissection`
 * (multifrontal Cholesky over the separator tree), `profileChain` (multifrontal Cholesky over
 * blocks of a profile order: the unknowns sorted along the principal axis of their plane
 * coordinates when every unknown but the dense rows has them, reverse Cuthill-McKee otherwise),
 * `envelope` (envelope Cholesky in that order, the earlier method, kept for comparison), or
 * `automatic` (dense, nested dissection or profile chain by DENSE_FRONT_DENSITY and
 * NESTED_DISSECTION_DENSITY, per call).
 */
export type LinearEvidenceFactorisation = 'automatic' | 'nestedDissection' | 'profileChain' | 'envelope' | 'dense';

/**
 * The evidence of a linear Gaussian model with its unknowns integrated out: data d with inverse
 * variances w_i at N pixels, unknowns x with prior N(0, P^-1), model R x. With A = P + R^T W R
 * and b = R^T W d (NormalMatrix),
 *   ln Z = -1/2 sum_i ln(2 pi / w_i) - 1/2 d^T W d + 1/2 b^T A^-1 b - 1/2 ln det A + 1/2 ln det P
 * (the Gaussian integral over x; e.g. MacKay 2003, ch. 28; Suyu et al. 2006 give it for a
 * regularised source). A is factored with the dense amplitude rows last, by default with the
 * multifrontal Cholesky in nested-dissection order (the unknowns' plane coordinates guide it)
 * or in a profile order (the unknowns swept along their principal axis, or reverse
 * Cuthill-McKee without coordinates), or as one dense front, whichever suits A's density;
 * every choice gives ln Z to rounding. An ordering and its analysis are kept while A's
 * pattern (and the coordinates, for the orderings that read them) stay the same, so the
 * ordering is a function of those alone: results do not depend on which calls came before
 * (threads, resumed runs). The caller passes ln det P. Buffers are reused.
 */
export class LinearEvidence {
  private readonly ordering = new ReverseCuthillMcKee();
  private readonly sweep = new PrincipalAxisOrder();
  private readonly envelope = new EnvelopeCholesky();
  private readonly dissection = new NestedDissection();
  private readonly chain = new SupernodeChain();
  private readonly multifrontal = new MultifrontalCholesky();
  private readonly dense = new DenseCholesky();
  private order = new Int32Array(0);
  private last = new Int32Array(0);
  private used: Exclude<LinearEvidenceFactorisation, 'automatic'> = 'envelope';
  /** What the multifrontal factor was last analysed for: the ordering, coordinates (pointCount -1: none) and dense count. */
  private analysedFor: 'nestedDissection' | 'profileChain' | null = null;
  private pointX = new Float64Array(0);
  private pointY = new Float64Array(0);
  private pointCount = -1;
  private analysedLast = -1;
  /** Whether the kept profile analysis came from the principal-axis sweep (else from reverse Cuthill-McKee). */
  private analysedSwept = false;
  /** A^-1 b once `solution` has been asked for since the last evaluation. */
  private solved = new Float64Array(0);
  /** Whether the last evaluation's back substitution is still to do (solution then makes it). */
  private solutionPending = false;
  private readonly constantTerm: number;

  /** `data` and `inverseVariance` at the N pixels fix the first two terms. */
  constructor(data: Float64Array, inverseVariance: Float64Array, readonly factorisation: LinearEvidenceFactorisation = 'automatic') {
    let constant = 0;
    for (let e = 0; e < data.length; e++) constant += Math.log((2 * Math.PI) / inverseVariance[e]) + data[e] * data[e] * inverseVariance[e];
    this.constantTerm = -0.5 * constant;
  }

  /** Order of A in the last evaluation. */
  get size(): number {
    return this.used === 'envelope' ? this.envelope.size : this.used === 'dense' ? this.dense.size : this.multifrontal.size;
  }

  /** The factorisation the last evaluation used. */
  get lastFactorisation(): Exclude<LinearEvidenceFactorisation, 'automatic'> {
    return this.used;
  }

  /**
   * ln Z for the normal matrix (its last `lastCount` rows ordered last), or NaN when A is not
   * positive definite. `points`: plane coordinates of the first unknowns (source cells), or null.
   */
  evaluate(normal: NormalMatrix, lastCount: number, logDetPrior: number, points: PlanePoints | null = null): number {
    const size = normal.size;
    this.last = ensureInt32Capacity(this.last, Math.max(1, lastCount));
    for (let a = 0; a < lastCount; a++) this.last[a] = size - lastCount + a;
    this.used = this.choose(normal);
    const logDetA = this.used === 'envelope' ? this.factorEnvelope(normal, lastCount)
      : this.used === 'dense' ? this.dense.factor(normal) : this.factorMultifrontal(normal, lastCount, points);
    this.solutionPending = false;
    if (Number.isNaN(logDetA)) return Number.NaN;
    // b^T A^-1 b = y^T y with L y = P b: the forward half of the solve is all ln Z needs; the
    // back half, A^-1 b itself, waits until `solution` is read (reports, model images).
    const quadratic = this.used === 'envelope' ? this.envelope.forwardSolve(normal.rhs)
      : this.used === 'dense' ? this.dense.forwardSolve(normal.rhs) : this.multifrontal.forwardSolve(normal.rhs);
    this.solutionPending = true;
    return this.constantTerm + 0.5 * quadratic - 0.5 * logDetA + 0.5 * logDetPrior;
  }

  /**
   * A^-1 b of the last evaluation when it succeeded (the posterior mean of the unknowns), made by
   * the back substitution on the first reading after it; read it before the next evaluation.
   */
  get solution(): Float64Array {
    if (this.solutionPending) {
      const size = this.size;
      this.solved = ensureFloat64Capacity(this.solved, size);
      if (this.used === 'envelope') this.envelope.backSolve(this.solved);
      else if (this.used === 'dense') this.dense.backSolve(this.solved);
      else this.multifrontal.backSolve(this.solved);
      this.solutionPending = false;
    }
    return this.solved;
  }

  /**
   * The diagonal of A^-1 of the last successful evaluation into out[0 .. size - 1] (posterior
   * variances; Takahashi recurrences on the factor used). It allocates: once per run, for reports.
   */
  inverseDiagonal(out: Float64Array): void {
    if (this.used === 'envelope') envelopeInverseDiagonal(this.envelope, out);
    else if (this.used === 'dense') this.dense.inverseDiagonal(out);
    else this.multifrontal.inverseDiagonal(out);
  }

  private choose(normal: SymmetricCsr): Exclude<LinearEvidenceFactorisation, 'automatic'> {
    if (this.factorisation !== 'automatic') return this.factorisation;
    const n = normal.size;
    const stored = 2 * normal.rowStart[n] - n;
    if (stored >= DENSE_FRONT_DENSITY * n * n) return 'dense';
    return stored <= NESTED_DISSECTION_DENSITY * n * n ? 'nestedDissection' : 'profileChain';
  }

  private factorEnvelope(normal: NormalMatrix, lastCount: number): number {
    this.order = ensureInt32Capacity(this.order, normal.size);
    const order = this.ordering.order(normal, this.order, this.last.subarray(0, lastCount));
    this.envelope.analyse(normal, order);
    return this.envelope.factor(normal);
  }

  /** Orders and analyses unless the kept analysis was for this ordering, pattern, dense count and coordinates. */
  private factorMultifrontal(normal: NormalMatrix, lastCount: number, points: PlanePoints | null): number {
    const dissect = this.used === 'nestedDissection';
    // Both orderings read the coordinates when given (the sweep only when they cover every
    // unknown but the dense rows), so a kept analysis needs the same points as well.
    const swept = !dissect && points !== null && points.count + lastCount === normal.size;
    const kept = this.analysedFor === this.used && lastCount === this.analysedLast && swept === this.analysedSwept
      && (!(dissect || swept) || this.samePoints(points)) && this.multifrontal.isAnalysedFor(normal);
    if (kept) return this.multifrontal.factor(normal);
    this.analysedFor = null;
    this.order = ensureInt32Capacity(this.order, normal.size);
    const last = this.last.subarray(0, lastCount);
    let order: Int32Array = this.order;
    let tree: SupernodeTree;
    if (dissect) {
      tree = this.dissection.order(normal, points, last, order);
    } else {
      order = swept ? this.sweep.order(points, order, last) : this.ordering.order(normal, order, last);
      tree = this.chain.build(normal.size);
    }
    const logDet = this.multifrontal.analyseAndFactor(normal, order, tree);
    this.keepPoints(points);
    this.analysedSwept = swept;
    this.analysedFor = this.used === 'nestedDissection' ? 'nestedDissection' : 'profileChain';
    this.analysedLast = lastCount;
    return logDet;
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
