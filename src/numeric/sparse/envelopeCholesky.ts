import { ensureFloat64Capacity, ensureInt32Capacity } from './ensureCapacity.js';
import { dot } from './dot.js';
import { invertPermutation } from './invertPermutation.js';
import type { SymmetricCsr } from './symmetricCsr.js';

/**
 * Envelope (profile) Cholesky factorisation A = L L^T of a symmetric positive-definite sparse
 * matrix in a given ordering (George & Liu 1981, chapter 4: the row-oriented "bordering"
 * envelope scheme of their subroutine ESFCT, triangular solves as in ELSLV and EUSLV). Row i
 * of the permuted matrix keeps columns first[i] .. i, where first[i] is its leftmost nonzero;
 * Cholesky fills nothing outside this envelope. `analyse`
 * (symbolic: the envelope from the pattern and the ordering) and `factor` (numeric) are
 * separate, so a caller that keeps the pattern refactors with new values by calling `factor`
 * alone. Buffers are kept and grown across calls: no allocation once they have reached their
 * largest size. The factor is stored row by row: L[i][j] = lower[rowStart[i] + j - first[i]].
 */
export class EnvelopeCholesky {
  private n = 0;
  private factored = false;
  private orderBuffer = new Int32Array(0);
  private positionBuffer = new Int32Array(0);
  private firstBuffer = new Int32Array(0);
  private rowStartBuffer = new Int32Array(1);
  private lowerBuffer = new Float64Array(0);
  private work = new Float64Array(0);

  /** Order of the matrix last analysed. */
  get size(): number {
    return this.n;
  }

  /** Whether the last `factor` succeeded (and no `analyse` came after it). */
  get isFactored(): boolean {
    return this.factored;
  }

  /** Stored entries of L (the envelope and the diagonal). */
  get envelopeSize(): number {
    return this.rowStartBuffer[this.n];
  }

  /**
   * Floating-point operations of one factor: sum over the columns of the envelope of (their
   * entries, diagonal included)^2, the count MultifrontalCholesky.flops gives for its structure.
   */
  get flops(): number {
    return envelopeOperations(this.firstBuffer, this.n, this.work);
  }

  /** order[k]: original index of row k of the permuted matrix (read only). */
  get order(): Int32Array {
    return this.orderBuffer;
  }

  /** first[i]: leftmost column kept in row i of L (read only). */
  get first(): Int32Array {
    return this.firstBuffer;
  }

  /** Row i of L starts at lower[rowStart[i]] (read only, n + 1 entries). */
  get rowStart(): Int32Array {
    return this.rowStartBuffer;
  }

  /** The values of L after a successful `factor` (read only). */
  get lower(): Float64Array {
    return this.lowerBuffer;
  }

  /**
   * Symbolic step: the envelope of `matrix` permuted by `order` (order[k] = original index of
   * row k, e.g. from ReverseCuthillMcKee). Returns the envelope size; factor costs about the
   * sum of squared row lengths, and analyse only O(nonzeros), so a caller can compare candidate
   * orderings cheaply. Throws RangeError when `order` is not a permutation of 0 .. n - 1.
   */
  analyse(matrix: SymmetricCsr, order: Int32Array): number {
    const n = matrix.size;
    this.n = n;
    this.factored = false;
    this.orderBuffer = ensureInt32Capacity(this.orderBuffer, n);
    this.positionBuffer = ensureInt32Capacity(this.positionBuffer, n);
    this.firstBuffer = ensureInt32Capacity(this.firstBuffer, n);
    this.rowStartBuffer = ensureInt32Capacity(this.rowStartBuffer, n + 1);
    this.work = ensureFloat64Capacity(this.work, n);
    this.positionBuffer.fill(-1, 0, n);
    const bad = invertPermutation(order, n, this.orderBuffer, this.positionBuffer);
    if (bad >= 0) throw new RangeError(`ordering: entry ${bad} (${order[bad]}) is out of range 0 .. ${n - 1} or repeated`);
    leftmostColumns(matrix, this.positionBuffer, this.firstBuffer);
    rowStarts(this.firstBuffer, n, this.rowStartBuffer);
    this.lowerBuffer = ensureFloat64Capacity(this.lowerBuffer, this.rowStartBuffer[n]);
    return this.rowStartBuffer[n];
  }

  /**
   * Numeric step: factors `matrix`, whose pattern must lie within the envelope last analysed
   * (Error otherwise). Returns ln det A = 2 sum ln L_ii, or NaN when a pivot is not positive
   * (A is not positive definite, or holds NaN); it does not throw for that.
   */
  factor(matrix: SymmetricCsr): number {
    if (matrix.size !== this.n) throw new Error(`envelope Cholesky: analysed for order ${this.n}, given order ${matrix.size}`);
    this.factored = false;
    this.lowerBuffer.fill(0, 0, this.envelopeSize);
    const outside = scatterPermuted(matrix, this.positionBuffer, this.firstBuffer, this.rowStartBuffer, this.lowerBuffer);
    if (outside >= 0) throw new Error(`envelope Cholesky: entry in row ${outside} lies outside the analysed envelope; call analyse first`);
    const logDet = this.factorRows();
    this.factored = !Number.isNaN(logDet);
    return logDet;
  }

  /**
   * Solves A x = b with the last successful factor, b and x in the original ordering (they may
   * be the same array). Throws Error when there is no valid factor.
   */
  solve(b: Float64Array, x: Float64Array): void {
    this.forwardSolve(b);
    this.backSolve(x);
  }

  /**
   * The first half of solve: y = L^-1 P b, kept for backSolve; returns y^T y, which is
   * b^T A^-1 b (A = P^T L L^T P), all a Gaussian integral's exponent needs.
   */
  forwardSolve(b: Float64Array): number {
    if (!this.factored) throw new Error('envelope Cholesky: solve needs a successful factor first');
    gather(b, this.orderBuffer, this.n, this.work);
    this.forwardSubstitution();
    return dot(this.work, 0, this.work, 0, this.n);
  }

  /** The second half of solve: x = A^-1 b from the y of the last forwardSolve (no factor since). */
  backSolve(x: Float64Array): void {
    if (!this.factored) throw new Error('envelope Cholesky: solve needs a successful factor first');
    this.backSubstitution();
    scatter(this.work, this.orderBuffer, this.n, x);
  }

  /** Rows of L in turn; stops with NaN at the first pivot that is not positive. */
  private factorRows(): number {
    let logDet = 0;
    for (let i = 0; i < this.n; i++) {
      const pivot = this.factorRow(i);
      if (!(pivot > 0)) return Number.NaN;
      logDet += Math.log(pivot);
    }
    return logDet;
  }

  /** Row i of L by bordering: a triangular solve with the rows above, then the pivot L_ii^2 (George & Liu 1981, ch. 4). */
  private factorRow(i: number): number {
    const lower = this.lowerBuffer;
    const fi = this.firstBuffer[i];
    const base = this.rowStartBuffer[i] - fi;
    this.eliminateRow(i, fi, base);
    const pivot = lower[base + i] - dot(lower, base + fi, lower, base + fi, i - fi);
    if (pivot > 0) lower[base + i] = Math.sqrt(pivot);
    return pivot;
  }

  /** L[i][j] for j = first[i] .. i - 1: one step of the triangular solve with the rows above. */
  private eliminateRow(i: number, fi: number, base: number): void {
    const lower = this.lowerBuffer;
    const first = this.firstBuffer;
    const rowStart = this.rowStartBuffer;
    for (let j = fi; j < i; j++) {
      const fj = first[j];
      const baseJ = rowStart[j] - fj;
      const from = fi > fj ? fi : fj;
      lower[base + j] = (lower[base + j] - dot(lower, base + from, lower, baseJ + from, j - from)) / lower[baseJ + j];
    }
  }

  /** L y = P b, in place in work, row by row (George & Liu 1981, ch. 4, subroutine ELSLV). */
  private forwardSubstitution(): void {
    const { lowerBuffer: lower, firstBuffer: first, rowStartBuffer: rowStart, work } = this;
    for (let i = 0; i < this.n; i++) {
      const base = rowStart[i] - first[i];
      work[i] = (work[i] - dot(lower, base + first[i], work, first[i], i - first[i])) / lower[base + i];
    }
  }

  /** L^T z = y, in place in work, taking the rows of L as columns of L^T (George & Liu 1981, ch. 4, EUSLV). */
  private backSubstitution(): void {
    const { lowerBuffer: lower, firstBuffer: first, rowStartBuffer: rowStart, work } = this;
    for (let i = this.n - 1; i >= 0; i--) {
      const base = rowStart[i] - first[i];
      const zi = work[i] / lower[base + i];
      work[i] = zi;
      subtractMultiple(work, first[i], lower, base + first[i], zi, i - first[i]);
    }
  }
}

/** first[i] = least permuted column of a nonzero in permuted row i (i itself when none is left of it). */
function leftmostColumns(matrix: SymmetricCsr, position: Int32Array, first: Int32Array): void {
  const { rowStart, column } = matrix;
  for (let i = 0; i < matrix.size; i++) first[position[i]] = position[i];
  for (let r = 0; r < matrix.size; r++) {
    const pr = position[r];
    for (let p = rowStart[r]; p < rowStart[r + 1]; p++) {
      const pc = position[column[p]];
      if (pc < pr) {
        if (pc < first[pr]) first[pr] = pc;
      } else if (pr < first[pc]) first[pc] = pr;
    }
  }
}

/** sum_j c_j^2, c_j = 1 + number of rows i > j with first[i] <= j (a difference array in `work`). */
function envelopeOperations(first: Int32Array, n: number, work: Float64Array): number {
  work.fill(0, 0, n);
  for (let i = 0; i < n; i++) {
    work[first[i]]++;
    work[i]--;
  }
  let count = 1;
  let sum = 0;
  for (let j = 0; j < n; j++) {
    count += work[j];
    sum += count * count;
  }
  return sum;
}

function rowStarts(first: Int32Array, n: number, rowStart: Int32Array): void {
  rowStart[0] = 0;
  for (let i = 0; i < n; i++) rowStart[i + 1] = rowStart[i] + i - first[i] + 1;
}

/** Adds the entries of matrix into the envelope in permuted order; returns a permuted row whose entry lies outside, or -1. */
function scatterPermuted(
  matrix: SymmetricCsr, position: Int32Array, first: Int32Array, envelopeStart: Int32Array, lower: Float64Array,
): number {
  const { rowStart, column, value } = matrix;
  for (let r = 0; r < matrix.size; r++) {
    const pr = position[r];
    for (let p = rowStart[r]; p < rowStart[r + 1]; p++) {
      const pc = position[column[p]];
      const row = pr > pc ? pr : pc;
      const col = pr > pc ? pc : pr;
      if (col < first[row]) return row;
      lower[envelopeStart[row] + col - first[row]] += value[p];
    }
  }
  return -1;
}

/** y[q ..] -= factor * a[p ..], `length` entries. */
function subtractMultiple(y: Float64Array, q: number, a: Float64Array, p: number, factor: number, length: number): void {
  for (let t = 0; t < length; t++) y[q + t] -= factor * a[p + t];
}

function gather(b: Float64Array, order: Int32Array, n: number, out: Float64Array): void {
  for (let k = 0; k < n; k++) out[k] = b[order[k]];
}

function scatter(work: Float64Array, order: Int32Array, n: number, x: Float64Array): void {
  for (let k = 0; k < n; k++) x[order[k]] = work[k];
}
