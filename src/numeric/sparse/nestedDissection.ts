import { CoordinateBisection } from './coordinateBisection.js';
import { ensureInt32Capacity } from './ensureCapacity.js';
import { levelBisection } from './levelBisection.js';
import type { GrowableSupernodeTree, SupernodeTree } from './supernodeTree.js';
import { SymmetricAdjacency } from './symmetricAdjacency.js';
import type { SymmetricCsr } from './symmetricCsr.js';

/** Largest set numbered as one leaf supernode (see the commit that set it). */
export const NESTED_DISSECTION_LEAF = 64;

/** Plane coordinates of the unknowns 0 .. count - 1 (x[v], y[v]); the others have none. */
export interface PlanePoints {
  readonly x: ArrayLike<number>;
  readonly y: ArrayLike<number>;
  readonly count: number;
}

const NONE: readonly number[] = [];

/**
 * Nested-dissection ordering of a symmetric sparse matrix (George 1973, SIAM J. Numer. Anal. 10,
 * 345; George & Liu 1981, chapter 8) with its separator tree as supernodes for
 * MultifrontalCholesky: a set of unknowns is split into two parts and a separator (no edge
 * joins the parts), the parts are numbered first, recursively, and the separator after them;
 * a set of at most `leafSize` unknowns is one leaf. A set whose unknowns all have plane
 * coordinates is cut by the straight line giving the smallest balanced separator (CoordinateBisection), any other by a
 * level structure of its graph (levelBisection). The unknowns listed in `root` (dense rows, e.g.
 * the amplitudes of extra linear components, which join everything) are left out of the graph
 * and numbered last, in the root supernode with the first separator. Each separator and each
 * leaf is one supernode; supernodes come in post-order with their parents. Buffers are kept and
 * grown across calls.
 */
export class NestedDissection {
  private readonly graph = new SymmetricAdjacency();
  private readonly bisection = new CoordinateBisection();
  private include = new Uint8Array(0);
  private mask = new Uint8Array(0);
  private nodes = new Int32Array(0);
  private scratch = new Int32Array(0);
  private label = new Int32Array(0);
  private levelNodes = new Int32Array(0);
  private levelStart = new Int32Array(0);
  private pending = new Int32Array(0);
  private pendingCount = 0;
  private stamp = 0;
  private numbered = 0;
  private target: Int32Array = new Int32Array(0);
  private points: PlanePoints = { x: NONE, y: NONE, count: 0 };
  private readonly tree: GrowableSupernodeTree = { count: 0, start: new Int32Array(1), parent: new Int32Array(0) };

  /** `leafSize`: the largest set numbered as one supernode without a further split (>= 1). */
  constructor(readonly leafSize = NESTED_DISSECTION_LEAF) {
    if (!(Number.isInteger(leafSize) && leafSize >= 1)) throw new RangeError(`nested dissection leaf size: expected a whole number >= 1, found ${leafSize}`);
  }

  /**
   * Writes the ordering into order[0 .. n - 1] (order[k] = original index of the k-th row and
   * column of the permuted matrix) and returns the supernode tree, a view of buffers valid until
   * the next call. `points` gives coordinates of the first points.count unknowns (or null);
   * `root` the unknowns to number last. Throws RangeError for a `root` entry out of range or
   * repeated, or a buffer too small.
   */
  order(matrix: SymmetricCsr, points: PlanePoints | null, root: ArrayLike<number>, order: Int32Array): SupernodeTree {
    const n = matrix.size;
    if (order.length < n) throw new RangeError(`ordering buffer: expected room for ${n} indices, found ${order.length}`);
    this.prepare(n);
    this.points = points ?? { x: NONE, y: NONE, count: 0 };
    markRoot(root, this.include, n);
    this.graph.build(matrix, this.include);
    const others = listIncluded(this.include, n, this.nodes);
    this.target = order;
    this.dissect(0, others);
    this.finishRoot(root, others);
    this.target = new Int32Array(0);
    return this.tree;
  }

  private prepare(n: number): void {
    if (this.include.length < n) this.include = new Uint8Array(Math.max(n, Math.ceil(this.include.length * 1.5)));
    if (this.mask.length < n) this.mask = new Uint8Array(Math.max(n, Math.ceil(this.mask.length * 1.5)));
    this.nodes = ensureInt32Capacity(this.nodes, n);
    this.scratch = ensureInt32Capacity(this.scratch, n);
    this.label = ensureInt32Capacity(this.label, n);
    this.levelNodes = ensureInt32Capacity(this.levelNodes, n);
    this.levelStart = ensureInt32Capacity(this.levelStart, n + 1);
    this.pending = ensureInt32Capacity(this.pending, n + 1);
    this.tree.start = ensureInt32Capacity(this.tree.start, n + 2);
    this.tree.parent = ensureInt32Capacity(this.tree.parent, n + 1);
    this.include.fill(1, 0, n);
    this.mask.fill(0, 0, n);
    this.label.fill(-1, 0, n);
    this.tree.count = 0;
    this.tree.start[0] = 0;
    this.pendingCount = 0;
    this.stamp = 0;
    this.numbered = 0;
  }

  /**
   * Numbers nodes[from .. to - 1]: the parts, then the separator as a supernode adopting the
   * parts' top supernodes. Top supernodes without a parent yet are left on the pending list
   * (those of the parts when the separator is empty).
   */
  private dissect(from: number, to: number): void {
    if (to === from) return;
    if (to - from <= this.leafSize || !this.split(from, to)) {
      this.pushPending(this.emit(from, to));
      return;
    }
    const sizeA = countLabelled(this.nodes, from, to, this.label, this.stamp - 3);
    const sizeB = countLabelled(this.nodes, from, to, this.label, this.stamp - 2);
    partitionByLabel(this.nodes, from, to, this.label, this.stamp - 3, this.scratch);
    const pendingBefore = this.pendingCount;
    this.dissect(from, from + sizeA);
    this.dissect(from + sizeA, from + sizeA + sizeB);
    if (from + sizeA + sizeB === to) return;
    const separator = this.emit(from + sizeA + sizeB, to);
    this.adoptPending(pendingBefore, separator);
    this.pushPending(separator);
  }

  /** Labels nodes[from .. to - 1] as A, B, separator with the next three stamps; false when the set cannot be split. */
  private split(from: number, to: number): boolean {
    const stamp = this.stamp;
    this.stamp += 3;
    if (allBelow(this.nodes, from, to, this.points.count)) {
      this.bisection.split(this.graph, this.nodes, from, to, this.points.x, this.points.y, this.label, stamp);
      return true;
    }
    return levelBisection(this.graph, this.nodes, from, to, this.mask, this.levelNodes, this.levelStart, this.label, stamp);
  }

  /** Numbers nodes[from .. to - 1] next, as a new supernode without a parent; returns its index. */
  private emit(from: number, to: number): number {
    const { tree, target } = this;
    for (let t = from; t < to; t++) target[this.numbered++] = this.nodes[t];
    const s = tree.count++;
    tree.start[s + 1] = this.numbered;
    tree.parent[s] = -1;
    return s;
  }

  private pushPending(s: number): void {
    this.pending[this.pendingCount++] = s;
  }

  /** The pending supernodes from index `from` on become children of `parent` and leave the list. */
  private adoptPending(from: number, parent: number): void {
    for (let t = from; t < this.pendingCount; t++) this.tree.parent[this.pending[t]] = parent;
    this.pendingCount = from;
  }

  /**
   * Numbers the root unknowns last: into the single top supernode when there is one (it then
   * holds the first separator, or the whole set when that was a leaf), else as a new supernode
   * adopting every top supernode. Without root unknowns the tops stay roots (a forest).
   */
  private finishRoot(root: ArrayLike<number>, others: number): void {
    if (root.length === 0) return;
    for (let t = 0; t < root.length; t++) this.target[others + t] = root[t];
    this.numbered = others + root.length;
    const { tree } = this;
    if (this.pendingCount === 1) {
      tree.start[tree.count] = this.numbered;
      return;
    }
    const s = tree.count++;
    tree.start[s + 1] = this.numbered;
    tree.parent[s] = -1;
    this.adoptPending(0, s);
  }
}

/** Clears include on the root unknowns; throws RangeError on one out of range or repeated. */
function markRoot(root: ArrayLike<number>, include: Uint8Array, n: number): void {
  for (let t = 0; t < root.length; t++) {
    const v = root[t];
    if (!(Number.isInteger(v) && v >= 0 && v < n) || include[v] === 0) {
      throw new RangeError(`unknowns of the root supernode: entry ${t} (${v}) is out of range 0 .. ${n - 1} or repeated`);
    }
    include[v] = 0;
  }
}

/** Writes the included nodes into nodes[0 ..] in increasing order; returns how many. */
function listIncluded(include: Uint8Array, n: number, nodes: Int32Array): number {
  let count = 0;
  for (let v = 0; v < n; v++) if (include[v] !== 0) nodes[count++] = v;
  return count;
}

/** Whether every node of the range is below `count` (has coordinates). */
function allBelow(nodes: Int32Array, from: number, to: number, count: number): boolean {
  for (let t = from; t < to; t++) if (nodes[t] >= count) return false;
  return true;
}

function countLabelled(nodes: Int32Array, from: number, to: number, label: Int32Array, value: number): number {
  let count = 0;
  for (let t = from; t < to; t++) if (label[nodes[t]] === value) count++;
  return count;
}

/** Stable reorder of the range into [label a | label a + 1 | label a + 2], through scratch. */
function partitionByLabel(nodes: Int32Array, from: number, to: number, label: Int32Array, a: number, scratch: Int32Array): void {
  let next = from;
  for (let part = 0; part < 3; part++) {
    for (let t = from; t < to; t++) if (label[nodes[t]] === a + part) scratch[next++] = nodes[t];
  }
  for (let t = from; t < to; t++) nodes[t] = scratch[t];
}
