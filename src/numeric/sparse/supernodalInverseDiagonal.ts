import { dot } from './dot.js';
import type { SupernodalFactor } from './supernodalFactor.js';

/**
 * The diagonal of A^-1, in the original ordering, from a supernodal factor A = P^T L L^T P
 * (the posterior variance of each unknown when A is a posterior precision), by the recurrence
 * of Takahashi, Fagan & Chin (1973) for the entries Z of A^-1 = L^-T L^-1 on the pattern of L:
 *   Z_ij = -(1 / L_jj) sum_{k > j} L_kj Z_ki   (i > j),
 *   Z_jj = (1 / L_jj) (1 / L_jj - sum_{k > j} L_kj Z_kj),
 * the sums over the nonzeros of column j of L, so Z is needed only on the pattern of L (Erisman
 * & Tinney 1975, Commun. ACM 18, 177). On supernodes, in the inverse multifrontal form of
 * Campbell & Davis (1995, University of Florida report TR-95-021; both references from
 * memory): supernodes from the root down, each front's Z (its own columns and its structure
 * rows, a dense f x f block) starts from Z on its structure rows, gathered from the parent's
 * front (R_s lies in the parent's front), then the recurrence runs over its columns from the
 * last to the first. The fronts of the supernodes on the path from the root are kept, in a
 * stack. Cost ~ sum over supernodes of w f^2, that of the factorisation. It allocates the stack:
 * it is meant for a report, once per run, not for the likelihood.
 */
export function supernodalInverseDiagonal(factor: SupernodalFactor, out: Float64Array): void {
  const n = factor.size;
  if (!factor.isFactored) throw new Error('inverse diagonal: needs a successful factor first');
  if (out.length < n) throw new RangeError(`inverse diagonal: expected room for ${n} values, found ${out.length}`);
  const count = factor.supernodeCount;
  const offset = new Float64Array(count);
  const z = new Float64Array(largestPathStorage(factor, offset));
  inverseFronts(factor, offset, z, out);
}

/** Rows f_s of supernode s's front (its columns and its structure rows). */
function frontSize(factor: SupernodalFactor, s: number): number {
  return factor.supernodeStart[s + 1] - factor.supernodeStart[s] + factor.structureStart[s + 1] - factor.structureStart[s];
}

function frontStorage(factor: SupernodalFactor, s: number): number {
  return frontSize(factor, s) * frontSize(factor, s);
}

/** offset[s] = where s's front lies in the stack (sum of its ancestors' fronts); returns the largest path total. */
function largestPathStorage(factor: SupernodalFactor, offset: Float64Array): number {
  let largest = 0;
  for (let s = factor.supernodeCount - 1; s >= 0; s--) {
    const p = factor.supernodeParent[s];
    offset[s] = p < 0 ? 0 : offset[p] + frontStorage(factor, p);
    largest = Math.max(largest, offset[s] + frontStorage(factor, s));
  }
  return largest;
}

/** Supernodes from the last to the first (every parent before its children). */
function inverseFronts(factor: SupernodalFactor, offset: Float64Array, z: Float64Array, out: Float64Array): void {
  for (let s = factor.supernodeCount - 1; s >= 0; s--) inverseFront(factor, s, offset, z, out);
}

/** Z on supernode s's front (full, column-major, at z[offset[s] ..]); its diagonal into out. */
function inverseFront(factor: SupernodalFactor, s: number, offset: Float64Array, z: Float64Array, out: Float64Array): void {
  const first = factor.supernodeStart[s];
  const width = factor.supernodeStart[s + 1] - first;
  const from = factor.structureStart[s];
  const m = factor.structureStart[s + 1] - from;
  const f = width + m;
  const base = offset[s];
  const p = factor.supernodeParent[s];
  if (m > 0) {
    gatherStructureBlock(factor.relative, from, m, z, offset[p], frontSize(factor, p), base, f, width);
  }
  takahashiColumns(factor.lower, factor.factorStart[s], z, base, f, width);
  copyFrontDiagonal(z, base, f, width, factor.order, first, out);
}

/** Z[w + a, w + b] = Z_parent[relative a, relative b] for the structure rows a, b (both triangles). */
function gatherStructureBlock(
  relative: Int32Array, from: number, m: number, z: Float64Array, parentBase: number, parentSize: number, base: number, f: number, width: number,
): void {
  for (let b = 0; b < m; b++) {
    const source = parentBase + relative[from + b] * parentSize;
    const target = base + (width + b) * f + width;
    for (let a = 0; a < m; a++) z[target + a] = z[source + relative[from + a]];
  }
}

/** The recurrence over the front's own columns, last first; Z stored in both triangles. */
function takahashiColumns(lower: Float64Array, lowerBase: number, z: Float64Array, base: number, f: number, width: number): void {
  for (let j = width - 1; j >= 0; j--) takahashiColumn(lower, lowerBase + j * f, z, base, f, j);
}

/** Column j of Z below the diagonal (and row j by symmetry), then Z_jj. */
function takahashiColumn(lower: Float64Array, column: number, z: Float64Array, base: number, f: number, j: number): void {
  const ljj = lower[column + j];
  for (let i = j + 1; i < f; i++) {
    const zij = -dot(lower, column + j + 1, z, base + i * f + j + 1, f - j - 1) / ljj;
    z[base + j * f + i] = zij;
    z[base + i * f + j] = zij;
  }
  z[base + j * f + j] = (1 / ljj - dot(lower, column + j + 1, z, base + j * f + j + 1, f - j - 1)) / ljj;
}

function copyFrontDiagonal(z: Float64Array, base: number, f: number, width: number, order: Int32Array, first: number, out: Float64Array): void {
  for (let j = 0; j < width; j++) out[order[first + j]] = z[base + j * f + j];
}
