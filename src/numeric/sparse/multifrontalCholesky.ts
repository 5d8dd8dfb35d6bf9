import { ensureFloat64Capacity, ensureInt32Capacity } from './ensureCapacity.js';
import { dot } from './dot.js';
import { FrontMemory, type FrontEngine } from './frontMemory.js';
import { assembleEntries, pushUpdate, relativeRuns, zeroLower } from './frontOperations.js';
import { invertPermutation } from './invertPermutation.js';
import { partialCholesky } from './partialCholesky.js';
import {
  collectFromAncestors, columnOperations, copySupernodes, countEntries, entryTargets, fillEntries,
  firstOutOfPostOrder, linkChildren, markChildRows, markEntryRows, relativeRows, sameInt32, setLocalPositions,
} from './multifrontalSymbolic.js';
import { runningSum } from './runningSum.js';
import type { SupernodalFactor } from './supernodalFactor.js';
import { supernodalInverseDiagonal } from './supernodalInverseDiagonal.js';
import { backSupernode, forwardSupernode, gather, scatter } from './supernodalSolve.js';
import type { SupernodeTree } from './supernodeTree.js';
import type { SymmetricCsr } from './symmetricCsr.js';

/**
 * Multifrontal Cholesky factorisation A = P^T L L^T P of a symmetric positive-definite sparse
 * matrix over a supernode tree (Duff & Reid 1983, ACM Trans. Math. Software 9, 302; Liu 1992,
 * SIAM Review 34, 82). Each supernode gathers a dense front (its columns and the rows of its
 * structure) from A's entries and its children's update matrices (extend-add), factors its
 * columns and passes the Schur complement of the rest to its parent; the dense work runs in
 * register-blocked kernels (partialCholesky). The update matrices live on a stack, since in
 * post-order a parent's children are the last supernodes factored before it; the last child's
 * stays in its own front (two fronts alternate), read there by the parent that comes next, which
 * spares a chain of supernodes (a profile ordering) every copy.
 *
 * `analyse` is the symbolic step: each supernode's row structure from A's pattern and its
 * children's, storage offsets, the map of every entry of A to its place in a front and the
 * positions of each child's rows in its parent's front, so that `factor` is a pure numeric
 * pass over the same pattern. Buffers are kept and grown across calls: no allocation once they
 * have reached their largest size. ln det A, `solve`, and `inverseDiagonal` (the posterior
 * variances) follow.
 */
export class MultifrontalCholesky implements SupernodalFactor {
  private n = 0;
  private count = 0;
  private factored = false;
  private analysed = false;
  private entries = 0;
  private floatingPointOperations = 0;
  private factorNonzeros = 0;
  private stackTop = 0;
  private orderBuffer = new Int32Array(0);
  private positionBuffer = new Int32Array(0);
  private startBuffer = new Int32Array(1);
  private parentBuffer = new Int32Array(0);
  private firstChild = new Int32Array(0);
  private nextSibling = new Int32Array(0);
  private mark = new Int32Array(0);
  private local = new Int32Array(0);
  private structureStartBuffer = new Int32Array(1);
  private rowIndexBuffer = new Int32Array(0);
  private relativeBuffer = new Int32Array(0);
  /** One past the end of the run of consecutive relative positions holding each structure row (relativeRuns). */
  private runEndBuffer = new Int32Array(0);
  private factorStartBuffer = new Int32Array(1);
  private columnStart = new Int32Array(1);
  private entrySource = new Int32Array(0);
  private entryTarget = new Int32Array(0);
  private entryHigh = new Int32Array(0);
  private patternRowStart = new Int32Array(1);
  private patternColumn = new Int32Array(0);
  private lowerBuffer = new Float64Array(0);
  /** The fronts, the stack and the children's relative rows, where the dense and extend-add kernels run. */
  private readonly fronts: FrontMemory;
  private work = new Float64Array(0);
  private structureWork = new Float64Array(0);

  /** `engine`: where the fronts' extend-add and dense kernels run (FrontMemory); the results are the same to the bit. */
  constructor(engine: FrontEngine = 'auto') {
    this.fronts = new FrontMemory(engine);
  }

  /** Order of the matrix last analysed. */
  get size(): number {
    return this.n;
  }

  /** Whether the last `factor` succeeded (and no `analyse` came after it). */
  get isFactored(): boolean {
    return this.factored;
  }

  /** Nonzeros of L (lower triangle, diagonal included) in the analysed structure. */
  get factorEntries(): number {
    return this.factorNonzeros;
  }

  /** Floating-point operations of one factor: sum over the columns of L of (its nonzero count)^2 (n^3 / 3 for a dense n x n). */
  get flops(): number {
    return this.floatingPointOperations;
  }

  /** order[k]: original index of row k of the permuted matrix (read only). */
  get order(): Int32Array {
    return this.orderBuffer;
  }

  get supernodeCount(): number {
    return this.count;
  }

  get supernodeStart(): Int32Array {
    return this.startBuffer;
  }

  get supernodeParent(): Int32Array {
    return this.parentBuffer;
  }

  get structureStart(): Int32Array {
    return this.structureStartBuffer;
  }

  get rowIndex(): Int32Array {
    return this.rowIndexBuffer;
  }

  get relative(): Int32Array {
    return this.relativeBuffer;
  }

  get factorStart(): Int32Array {
    return this.factorStartBuffer;
  }

  /** The supernode blocks of L after a successful `factor` (read only; layout in SupernodalFactor). */
  get lower(): Float64Array {
    return this.lowerBuffer;
  }

  /**
   * Symbolic step for `matrix` permuted by `order` (order[k] = original index of row k) over the
   * supernodes of `tree` (e.g. both from NestedDissection). Returns the number of nonzeros of L.
   * Throws RangeError when `order` is not a permutation or `tree` is not a post-ordered
   * partition of 0 .. n - 1, and Error when the tree does not fit the pattern (an entry joins
   * two sibling subtrees).
   */
  analyse(matrix: SymmetricCsr, order: Int32Array, tree: SupernodeTree): number {
    const n = matrix.size;
    this.n = n;
    this.factored = false;
    this.analysed = false;
    this.copyOrder(order, n);
    this.copyTree(tree, n);
    this.copyPattern(matrix);
    this.bucketEntries(matrix);
    this.mark = ensureInt32Capacity(this.mark, n);
    this.local = ensureInt32Capacity(this.local, n);
    this.mark.fill(-1, 0, n);
    this.structureStartBuffer = ensureInt32Capacity(this.structureStartBuffer, Math.max(this.count, n) + 1);
    this.factorStartBuffer = ensureInt32Capacity(this.factorStartBuffer, Math.max(this.count, n) + 1);
    this.structureStartBuffer[0] = 0;
    this.factorStartBuffer[0] = 0;
    this.floatingPointOperations = 0;
    this.factorNonzeros = 0;
    const largestFront = this.analyseSupernodes();
    const structureEntries = this.structureStartBuffer[this.count];
    this.runEndBuffer = ensureInt32Capacity(this.runEndBuffer, structureEntries);
    for (let c = 0; c < this.count; c++) relativeRuns(this.relativeBuffer, this.runEndBuffer, this.structureStartBuffer[c], this.structureStartBuffer[c + 1]);
    this.fronts.prepare(largestFront * largestFront, this.stackPeak(), this.relativeBuffer, this.runEndBuffer, structureEntries);
    this.lowerBuffer = ensureFloat64Capacity(this.lowerBuffer, this.factorStartBuffer[this.count]);
    this.work = ensureFloat64Capacity(this.work, n);
    this.structureWork = ensureFloat64Capacity(this.structureWork, n);
    this.analysed = true;
    return this.factorNonzeros;
  }

  /** Whether the last successful `analyse` was for `matrix`'s pattern (then `factor` needs no new one). */
  isAnalysedFor(matrix: SymmetricCsr): boolean {
    return this.analysed && matrix.size === this.n && this.samePattern(matrix);
  }

  /**
   * Numeric step: factors `matrix`, whose pattern (rowStart and column arrays) must be the one
   * last analysed successfully (Error otherwise). Returns ln det A = 2 sum ln L_ii, or NaN when a pivot is
   * not positive (A is not positive definite, or holds NaN); it does not throw for that.
   */
  factor(matrix: SymmetricCsr): number {
    if (!this.isAnalysedFor(matrix)) {
      throw new Error('multifrontal Cholesky: the pattern differs from the one analysed; call analyse first');
    }
    return this.factorValues(matrix);
  }

  /** The numeric pass over the analysed pattern, which `matrix` has. */
  private factorValues(matrix: SymmetricCsr): number {
    this.factored = false;
    this.stackTop = 0;
    const logDet = this.factorSupernodes(matrix.value);
    this.factored = !Number.isNaN(logDet);
    return logDet;
  }

  /** `analyse` then `factor` of the same matrix, without checking again the pattern just analysed. */
  analyseAndFactor(matrix: SymmetricCsr, order: Int32Array, tree: SupernodeTree): number {
    this.analyse(matrix, order, tree);
    return this.factorValues(matrix);
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
    if (!this.factored) throw new Error('multifrontal Cholesky: solve needs a successful factor first');
    gather(b, this.orderBuffer, this.n, this.work);
    this.forwardSubstitution();
    return dot(this.work, 0, this.work, 0, this.n);
  }

  /** The second half of solve: x = A^-1 b from the y of the last forwardSolve (no factor since). */
  backSolve(x: Float64Array): void {
    if (!this.factored) throw new Error('multifrontal Cholesky: solve needs a successful factor first');
    this.backSubstitution();
    scatter(this.work, this.orderBuffer, this.n, x);
  }

  /**
   * The diagonal of A^-1 in the original ordering into out[0 .. n - 1] (supernodalInverseDiagonal;
   * it allocates: meant for a report, once per run). Throws Error without a successful factor.
   */
  inverseDiagonal(out: Float64Array): void {
    supernodalInverseDiagonal(this, out);
  }

  private copyOrder(order: Int32Array, n: number): void {
    if (order.length < n) throw new RangeError(`ordering: expected ${n} indices, found ${order.length}`);
    this.orderBuffer = ensureInt32Capacity(this.orderBuffer, n);
    this.positionBuffer = ensureInt32Capacity(this.positionBuffer, n);
    this.positionBuffer.fill(-1, 0, n);
    const bad = invertPermutation(order, n, this.orderBuffer, this.positionBuffer);
    if (bad >= 0) throw new RangeError(`ordering: entry ${bad} (${order[bad]}) is out of range 0 .. ${n - 1} or repeated`);
  }

  /** Copies and checks the tree; builds the child lists (children in increasing order). */
  private copyTree(tree: SupernodeTree, n: number): void {
    const count = tree.count;
    if (!(Number.isInteger(count) && count >= 0)) throw new RangeError(`supernode tree: expected a whole number of supernodes, found ${count}`);
    this.count = count;
    // Sized by n (no partition has more supernodes), so a smaller matrix never reallocates.
    this.startBuffer = ensureInt32Capacity(this.startBuffer, Math.max(count, n) + 1);
    this.parentBuffer = ensureInt32Capacity(this.parentBuffer, Math.max(count, n));
    this.firstChild = ensureInt32Capacity(this.firstChild, Math.max(count, n));
    this.nextSibling = ensureInt32Capacity(this.nextSibling, Math.max(count, n));
    const problem = copySupernodes(tree, n, this.startBuffer, this.parentBuffer);
    if (problem !== '') throw new RangeError(`supernode tree: ${problem}`);
    this.firstChild.fill(-1, 0, count);
    linkChildren(this.parentBuffer, count, this.firstChild, this.nextSibling);
    this.mark = ensureInt32Capacity(this.mark, 2 * Math.max(count, n));
    const unordered = firstOutOfPostOrder(this.parentBuffer, this.firstChild, this.nextSibling, count, this.mark);
    if (unordered >= 0) throw new RangeError(`supernode tree: the subtree of supernode ${unordered} is not contiguous (not in post-order)`);
  }

  private copyPattern(matrix: SymmetricCsr): void {
    const n = matrix.size;
    const stored = matrix.rowStart[n];
    this.entries = stored;
    this.patternRowStart = ensureInt32Capacity(this.patternRowStart, n + 1);
    this.patternColumn = ensureInt32Capacity(this.patternColumn, stored);
    this.patternRowStart.set(matrix.rowStart.subarray(0, n + 1));
    this.patternColumn.set(matrix.column.subarray(0, stored));
  }

  private samePattern(matrix: SymmetricCsr): boolean {
    return matrix.rowStart[this.n] === this.entries
      && sameInt32(matrix.rowStart, this.patternRowStart, this.n + 1)
      && sameInt32(matrix.column, this.patternColumn, this.entries);
  }

  /**
   * Groups A's stored entries by the smaller of their permuted indices (a counting sort): the
   * entries of permuted column j are t = columnStart[j] .. columnStart[j + 1] - 1, stored entry
   * entrySource[t] in permuted row entryHigh[t] >= j. A supernode's columns are contiguous, so
   * are its entries. (By column rather than by supernode: a few hundred counters spread the
   * increments that a few dozen would queue on one another.)
   */
  private bucketEntries(matrix: SymmetricCsr): void {
    const n = this.n;
    this.columnStart = ensureInt32Capacity(this.columnStart, n + 2);
    this.entrySource = ensureInt32Capacity(this.entrySource, this.entries);
    this.entryTarget = ensureInt32Capacity(this.entryTarget, this.entries);
    this.entryHigh = ensureInt32Capacity(this.entryHigh, this.entries);
    this.columnStart.fill(0, 0, n + 2);
    countEntries(matrix, this.positionBuffer, this.columnStart);
    runningSum(this.columnStart, n + 1);
    fillEntries(matrix, this.positionBuffer, this.columnStart, this.entrySource, this.entryHigh);
  }

  /** The symbolic pass over the supernodes in post-order; returns the largest front. */
  private analyseSupernodes(): number {
    let largest = 0;
    for (let s = 0; s < this.count; s++) largest = Math.max(largest, this.analyseSupernode(s));
    return largest;
  }

  /**
   * Supernode s's row structure, storage offset, operation count, entry targets and its
   * children's relative positions; returns its front size.
   */
  private analyseSupernode(s: number): number {
    const first = this.startBuffer[s];
    const end = this.startBuffer[s + 1];
    const width = end - first;
    const marked = this.markStructure(s, first, end);
    const from = this.structureStartBuffer[s];
    this.rowIndexBuffer = ensureInt32Capacity(this.rowIndexBuffer, from + marked);
    this.relativeBuffer = ensureInt32Capacity(this.relativeBuffer, from + marked);
    const found = collectFromAncestors(this.parentBuffer, this.startBuffer, s, this.mark, marked, this.rowIndexBuffer, from);
    if (found < marked) throw new Error(`multifrontal Cholesky: supernode ${s} is joined to a supernode outside its ancestors; the tree does not fit the pattern`);
    this.structureStartBuffer[s + 1] = from + marked;
    const frontSize = width + marked;
    this.factorStartBuffer[s + 1] = this.factorStartBuffer[s] + frontSize * width;
    this.factorNonzeros += (width * (width + 1)) / 2 + marked * width;
    this.floatingPointOperations += columnOperations(frontSize, width);
    setLocalPositions(this.rowIndexBuffer, from, from + marked, width, this.local);
    this.relativePositions(s, first, end);
    entryTargets(this.entryTarget, this.entryHigh, this.columnStart, first, end, frontSize, this.local);
    return frontSize;
  }

  /** Marks (with s) the rows below supernode s that its entries and its children's structures reach; returns how many. */
  private markStructure(s: number, first: number, end: number): number {
    const marked = markEntryRows(this.entryHigh, this.columnStart[first], this.columnStart[end], end, s, this.mark);
    let total = marked;
    for (let c = this.firstChild[s]; c >= 0; c = this.nextSibling[c]) {
      const reached = markChildRows(this.rowIndexBuffer, this.structureStartBuffer[c], this.structureStartBuffer[c + 1], first, end, s, this.mark);
      if (reached < 0) throw new Error(`multifrontal Cholesky: supernode ${c} is joined to a supernode outside its ancestors; the tree does not fit the pattern`);
      total += reached;
    }
    return total;
  }

  /** The positions in s's front of each child's structure rows (its own columns first, then R_s). */
  private relativePositions(s: number, first: number, end: number): void {
    for (let c = this.firstChild[s]; c >= 0; c = this.nextSibling[c]) {
      relativeRows(this.rowIndexBuffer, this.relativeBuffer, this.structureStartBuffer[c], this.structureStartBuffer[c + 1], first, end, this.local);
    }
  }

  /** Largest total size of the update matrices held on the stack at once in the post-order factorisation. */
  private stackPeak(): number {
    let top = 0;
    let peak = 0;
    for (let s = 0; s < this.count; s++) {
      peak = Math.max(peak, top);
      for (let c = this.firstChild[s]; c >= 0; c = this.nextSibling[c]) top -= this.stackedSize(c);
      top += this.stackedSize(s);
      peak = Math.max(peak, top);
    }
    return peak;
  }

  /**
   * Entries supernode s puts on the stack: its m x m update matrix (stored square), or none
   * when its parent comes right after it (its last child), which reads the update in s's front.
   */
  private stackedSize(s: number): number {
    if (this.parentBuffer[s] === s + 1) return 0;
    const m = this.structureStartBuffer[s + 1] - this.structureStartBuffer[s];
    return m * m;
  }

  /** The front buffer of supernode s: the two alternate, so a parent's front never overwrites its last child's. */
  private frontOf(s: number): Float64Array {
    return (s & 1) === 0 ? this.fronts.frontEven : this.fronts.frontOdd;
  }

  /** The numeric pass in post-order; stops with NaN at the first supernode with a pivot that is not positive. */
  private factorSupernodes(value: Float64Array): number {
    let logDet = 0;
    for (let s = 0; s < this.count; s++) {
      const supernodeLogDet = this.factorSupernode(s, value);
      if (Number.isNaN(supernodeLogDet)) return Number.NaN;
      logDet += supernodeLogDet;
    }
    return logDet;
  }

  /**
   * Assembles supernode s's front, factors its columns, stores them in L and pushes its update
   * matrix (unless its parent, next, reads it in place).
   */
  private factorSupernode(s: number, value: Float64Array): number {
    const width = this.startBuffer[s + 1] - this.startBuffer[s];
    const from = this.structureStartBuffer[s];
    const m = this.structureStartBuffer[s + 1] - from;
    const frontSize = width + m;
    const front = this.frontOf(s);
    zeroLower(front, frontSize);
    assembleEntries(front, value, this.entrySource, this.entryTarget, this.columnStart[this.startBuffer[s]], this.columnStart[this.startBuffer[s + 1]]);
    this.extendAddChildren(s, front, frontSize);
    const logDet = partialCholesky(front, frontSize, frontSize, width);
    if (Number.isNaN(logDet)) return Number.NaN;
    this.lowerBuffer.set(front.subarray(0, frontSize * width), this.factorStartBuffer[s]);
    if (this.stackedSize(s) > 0) pushUpdate(front, frontSize, width, m, this.fronts.stack, this.stackTop);
    this.stackTop += this.stackedSize(s);
    return logDet;
  }

  /**
   * Adds the children's update matrices into the front: those on the stack (its top, first child
   * lowest), which it pops, and the last child's in that child's front when it came just before.
   */
  private extendAddChildren(s: number, front: Float64Array, frontSize: number): void {
    let below = 0;
    for (let c = this.firstChild[s]; c >= 0; c = this.nextSibling[c]) below += this.stackedSize(c);
    let at = this.stackTop - below;
    this.stackTop = at;
    for (let c = this.firstChild[s]; c >= 0; c = this.nextSibling[c]) {
      const from = this.structureStartBuffer[c];
      const m = this.structureStartBuffer[c + 1] - from;
      if (this.stackedSize(c) > 0) {
        this.fronts.extendAdd(front, frontSize, this.fronts.stack, at, m, m, from);
        at += m * m;
        continue;
      }
      const childSize = this.startBuffer[c + 1] - this.startBuffer[c] + m;
      const trailing = (childSize - m) * (childSize + 1);
      this.fronts.extendAdd(front, frontSize, this.frontOf(c), trailing, childSize, m, from);
    }
  }

  /** L y = P b, in place in work, supernode by supernode. */
  private forwardSubstitution(): void {
    for (let s = 0; s < this.count; s++) {
      const first = this.startBuffer[s];
      const width = this.startBuffer[s + 1] - first;
      const from = this.structureStartBuffer[s];
      const m = this.structureStartBuffer[s + 1] - from;
      forwardSupernode(this.lowerBuffer, this.factorStartBuffer[s], width + m, width, first, this.rowIndexBuffer, from, this.work, this.structureWork);
    }
  }

  /** L^T z = y, in place in work, supernodes in reverse. */
  private backSubstitution(): void {
    for (let s = this.count - 1; s >= 0; s--) {
      const first = this.startBuffer[s];
      const width = this.startBuffer[s + 1] - first;
      const from = this.structureStartBuffer[s];
      const m = this.structureStartBuffer[s + 1] - from;
      backSupernode(this.lowerBuffer, this.factorStartBuffer[s], width + m, width, first, this.rowIndexBuffer, from, this.work, this.structureWork);
    }
  }
}
