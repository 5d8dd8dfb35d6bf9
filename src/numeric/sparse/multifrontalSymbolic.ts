import type { SupernodeTree } from './supernodeTree.js';
import type { SymmetricCsr } from './symmetricCsr.js';

// The symbolic step of MultifrontalCholesky (Liu 1992, SIAM Review 34, 82, sections 3-4): the
// supernode tree's checks, each supernode's row structure from A's entries and its children's,
// the place of every entry of A in its front, and the rows of each child in its parent's front.

/** Copies the supernode ranges and parents; returns '' or what is wrong. */
export function copySupernodes(tree: SupernodeTree, n: number, start: Int32Array, parent: Int32Array): string {
  const count = tree.count;
  if (tree.start.length < count + 1 || tree.parent.length < count) return `expected arrays for ${count} supernodes`;
  if (tree.start[0] !== 0 || tree.start[count] !== n) return `the supernodes cover columns ${tree.start[0]} .. ${tree.start[count] - 1}, not 0 .. ${n - 1}`;
  start[0] = 0;
  for (let s = 0; s < count; s++) {
    const first = tree.start[s];
    const end = tree.start[s + 1];
    const p = tree.parent[s];
    if (!(end > first)) return `supernode ${s} holds no column (start ${first}, end ${end})`;
    if (!(p === -1 || (p > s && p < count))) return `supernode ${s} has parent ${p}; expected -1 or a later supernode`;
    start[s + 1] = end;
    parent[s] = p;
  }
  return '';
}

/** Child lists: firstChild[p], then nextSibling[c], in increasing order of c. */
export function linkChildren(parent: Int32Array, count: number, firstChild: Int32Array, nextSibling: Int32Array): void {
  for (let s = count - 1; s >= 0; s--) {
    const p = parent[s];
    if (p < 0) {
      nextSibling[s] = -1;
      continue;
    }
    nextSibling[s] = firstChild[p];
    firstChild[p] = s;
  }
}

/**
 * The first supernode whose subtree is not the contiguous range ending at it (its first
 * descendant .. itself), or -1: then every parent's children are the last subtrees before it.
 * `scratch` holds 2 count entries (first descendant and subtree size).
 */
export function firstOutOfPostOrder(parent: Int32Array, firstChild: Int32Array, nextSibling: Int32Array, count: number, scratch: Int32Array): number {
  for (let s = 0; s < count; s++) {
    let firstDescendant = s;
    let size = 1;
    for (let c = firstChild[s]; c >= 0; c = nextSibling[c]) {
      firstDescendant = Math.min(firstDescendant, scratch[c]);
      size += scratch[count + c];
    }
    if (s - firstDescendant + 1 !== size) return s;
    scratch[s] = firstDescendant;
    scratch[count + s] = size;
  }
  return -1;
}

export function sameInt32(a: Int32Array, b: Int32Array, length: number): boolean {
  for (let t = 0; t < length; t++) if (a[t] !== b[t]) return false;
  return true;
}

/** columnStart[j + 2] = number of entries whose smaller permuted index is j. */
export function countEntries(matrix: SymmetricCsr, position: Int32Array, columnStart: Int32Array): void {
  const { rowStart, column } = matrix;
  for (let r = 0; r < matrix.size; r++) {
    const pr = position[r];
    for (let p = rowStart[r]; p < rowStart[r + 1]; p++) {
      const pc = position[column[p]];
      columnStart[(pc < pr ? pc : pr) + 2]++;
    }
  }
}

/**
 * Stable counting-sort scatter of the entries by smaller permuted index (columnStart[j + 1] ends
 * as the start of column j's entries): each entry's index and larger permuted index.
 */
export function fillEntries(matrix: SymmetricCsr, position: Int32Array, columnStart: Int32Array, entrySource: Int32Array, entryHigh: Int32Array): void {
  const { rowStart, column } = matrix;
  for (let r = 0; r < matrix.size; r++) {
    const pr = position[r];
    for (let p = rowStart[r]; p < rowStart[r + 1]; p++) {
      const pc = position[column[p]];
      const t = columnStart[(pc < pr ? pc : pr) + 1]++;
      entrySource[t] = p;
      entryHigh[t] = pc < pr ? pr : pc;
    }
  }
}

/** Marks with s the rows at or below `end` that s's entries reach, not yet marked; returns how many. */
export function markEntryRows(entryHigh: Int32Array, from: number, to: number, end: number, s: number, mark: Int32Array): number {
  let count = 0;
  for (let t = from; t < to; t++) {
    const r = entryHigh[t];
    if (r >= end && mark[r] !== s) {
      mark[r] = s;
      count++;
    }
  }
  return count;
}

/**
 * Marks with s the rows of a child's structure below s's columns, not yet marked; returns how
 * many, or -1 when a row lies before s's columns (in a subtree beside the child's).
 */
export function markChildRows(rowIndex: Int32Array, from: number, to: number, first: number, end: number, s: number, mark: Int32Array): number {
  let count = 0;
  for (let t = from; t < to; t++) {
    const r = rowIndex[t];
    if (r < first) return -1;
    if (r >= end && mark[r] !== s) {
      mark[r] = s;
      count++;
    }
  }
  return count;
}

/**
 * Writes the rows marked with s into rowIndex[from ..] in increasing order by walking the
 * columns of s's ancestors (which follow s in order); returns how many it found, fewer than
 * `marked` when a marked row lies outside the ancestors.
 */
export function collectFromAncestors(
  parent: Int32Array, start: Int32Array, s: number, mark: Int32Array, marked: number, rowIndex: Int32Array, from: number,
): number {
  let found = 0;
  for (let a = parent[s]; a >= 0 && found < marked; a = parent[a]) found = collectMarked(start[a], start[a + 1], s, mark, rowIndex, from, found);
  return found;
}

function collectMarked(first: number, end: number, s: number, mark: Int32Array, rowIndex: Int32Array, from: number, found: number): number {
  let count = found;
  for (let r = first; r < end; r++) if (mark[r] === s) rowIndex[from + count++] = r;
  return count;
}

/** sum_{j < width} (frontSize - j)^2: the operations of factoring `width` columns of a front (column j of L has frontSize - j nonzeros). */
export function columnOperations(frontSize: number, width: number): number {
  let sum = 0;
  for (let j = 0; j < width; j++) sum += (frontSize - j) * (frontSize - j);
  return sum;
}

/** local[row] = its position in the front (after the `width` own columns) for the structure rows. */
export function setLocalPositions(rowIndex: Int32Array, from: number, to: number, width: number, local: Int32Array): void {
  for (let t = from; t < to; t++) local[rowIndex[t]] = width + t - from;
}

/** Positions in the parent's front (own columns first .. end - 1, then its structure via local) of a child's structure rows. */
export function relativeRows(rowIndex: Int32Array, relative: Int32Array, from: number, to: number, first: number, end: number, local: Int32Array): void {
  for (let t = from; t < to; t++) {
    const r = rowIndex[t];
    relative[t] = r < end ? r - first : local[r];
  }
}

/** Each entry of the supernode's columns first .. end - 1: its column-major place in the front. */
export function entryTargets(
  entryTarget: Int32Array, entryHigh: Int32Array, columnStart: Int32Array, first: number, end: number, frontSize: number, local: Int32Array,
): void {
  for (let j = first; j < end; j++) {
    const columnBase = (j - first) * frontSize;
    for (let t = columnStart[j]; t < columnStart[j + 1]; t++) {
      const high = entryHigh[t];
      entryTarget[t] = columnBase + (high < end ? high - first : local[high]);
    }
  }
}
