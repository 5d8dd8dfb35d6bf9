/**
 * A partition of the columns 0 .. n - 1 of a permuted symmetric matrix into supernodes, and
 * the tree that joins them (the assembly tree of the multifrontal method, Duff & Reid 1983;
 * Liu 1990, SIAM J. Matrix Anal. Appl. 11, 134): supernode s holds the columns start[s] ..
 * start[s + 1] - 1 (at least one), its parent is parent[s] (-1 for a root). Supernodes are in
 * post-order: a parent comes after its children and each subtree's columns are contiguous. A
 * tree fits a matrix when each column's off-diagonal nonzeros below it lie in the columns of
 * its own supernode or of that supernode's ancestors (no entry joins two sibling subtrees);
 * then so does the Cholesky factor's. The arrays may be longer than needed (reused buffers).
 */
export interface SupernodeTree {
  readonly count: number;
  readonly start: Int32Array;
  readonly parent: Int32Array;
}

/** A SupernodeTree whose buffers its builder grows and rewrites (NestedDissection, SupernodeChain). */
export interface GrowableSupernodeTree {
  count: number;
  start: Int32Array<ArrayBuffer>;
  parent: Int32Array<ArrayBuffer>;
}
