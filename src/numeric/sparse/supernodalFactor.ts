/**
 * Read-only view of a supernodal Cholesky factor A = P^T L L^T P (MultifrontalCholesky), for
 * the steps that use L after it is computed (the inverse diagonal). Supernode s holds the
 * permuted columns start[s] .. start[s + 1] - 1 (w of them) and its off-diagonal row structure
 * R_s = rowIndex[structureStart[s] .. structureStart[s + 1] - 1] (m permuted rows, increasing,
 * all in ancestors' columns); its front is the f = w + m rows "own columns, then R_s". Its
 * columns of L are the f x w column-major block at lower[factorStart[s] ..] (leading dimension
 * f; entries above the diagonal of the leading w x w block are not part of L). relative[t], for
 * t in a supernode's R range, is the position of that row in the parent's front.
 */
export interface SupernodalFactor {
  readonly size: number;
  readonly isFactored: boolean;
  readonly order: Int32Array;
  readonly supernodeCount: number;
  readonly supernodeStart: Int32Array;
  readonly supernodeParent: Int32Array;
  readonly structureStart: Int32Array;
  readonly rowIndex: Int32Array;
  readonly relative: Int32Array;
  readonly factorStart: Int32Array;
  readonly lower: Float64Array;
}
