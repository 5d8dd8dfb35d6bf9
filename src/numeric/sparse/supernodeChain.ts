import { ensureInt32Capacity } from './ensureCapacity.js';
import type { GrowableSupernodeTree, SupernodeTree } from './supernodeTree.js';

/** Columns per supernode of a chain (see the commit that set it). */
export const CHAIN_BLOCK = 32;

/**
 * The supernode tree of a profile (envelope) ordering such as reverse Cuthill-McKee: blocks of
 * `block` consecutive columns, each the child of the next, so the multifrontal Cholesky over it
 * is a blocked envelope factorisation (the chain fits any pattern: every later supernode is an
 * ancestor). The structure of a block is the union of its columns' envelopes below it (George &
 * Liu 1981, chapter 4: fill stays within the envelope), so the operation count is the
 * envelope's plus the zeros of each dense block, while the dense work runs in the
 * register-blocked kernels. Buffers are kept and grown across calls.
 */
export class SupernodeChain {
  private readonly tree: GrowableSupernodeTree = { count: 0, start: new Int32Array(1), parent: new Int32Array(0) };

  /** The chain over columns 0 .. n - 1, a view of buffers valid until the next call. */
  build(n: number, block = CHAIN_BLOCK): SupernodeTree {
    if (!(Number.isInteger(block) && block >= 1)) throw new RangeError(`chain block: expected a whole number >= 1, found ${block}`);
    const count = Math.ceil(n / block);
    const tree = this.tree;
    tree.count = count;
    tree.start = ensureInt32Capacity(tree.start, count + 1);
    tree.parent = ensureInt32Capacity(tree.parent, count);
    fillChain(tree.start, tree.parent, count, n, block);
    return tree;
  }
}

function fillChain(start: Int32Array, parent: Int32Array, count: number, n: number, block: number): void {
  for (let s = 0; s < count; s++) {
    start[s] = s * block;
    parent[s] = s + 1 < count ? s + 1 : -1;
  }
  start[count] = n;
}
