import { describe, expect, it } from 'vitest';
import { NestedDissection } from '../../../src/numeric/sparse/nestedDissection.js';
import type { SupernodeTree } from '../../../src/numeric/sparse/supernodeTree.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../../../src/numeric/sparse/symmetricCsr.js';
import { isPermutation } from './rcmTestTools.js';
import { accumulate, denseTail, geometricCases, planePoints, spdCases, uniformStream, type Points, type SparseCase } from './sparseTestMatrices.js';

// The checks follow the definition of a nested-dissection ordering (George 1973; George & Liu
// 1981, chapter 8): each separator, numbered after the two parts it separates, with no edge
// between the parts; as a supernode tree, every edge of the matrix joins a supernode to itself
// or to one of its ancestors (so none joins two sibling subtrees), read off the matrix's own
// entries here, not off the graph the ordering built.

/** What is wrong with `tree` and `order` for `matrix`, or '' (post-order, contiguous subtrees, every edge to an ancestor). */
function treeProblem(matrix: SymmetricCsr, order: Int32Array, tree: SupernodeTree): string {
  const n = matrix.size;
  if (!isPermutation(order, n)) return 'not a permutation';
  if (tree.start[0] !== 0 || tree.start[tree.count] !== n) return 'supernodes do not cover 0 .. n - 1';
  const supernodeOf = new Int32Array(n);
  const firstDescendant = Array.from({ length: tree.count }, (_, s) => s);
  const subtreeSize = new Array<number>(tree.count).fill(1);
  for (let s = 0; s < tree.count; s++) {
    if (!(tree.start[s + 1] > tree.start[s])) return `supernode ${s} is empty`;
    for (let k = tree.start[s]; k < tree.start[s + 1]; k++) supernodeOf[k] = s;
    if (s - firstDescendant[s] + 1 !== subtreeSize[s]) return `subtree of ${s} not contiguous`;
    const p = tree.parent[s];
    if (p === -1) continue;
    if (!(p > s && p < tree.count)) return `supernode ${s} has parent ${p}`;
    firstDescendant[p] = Math.min(firstDescendant[p], firstDescendant[s]);
    subtreeSize[p] += subtreeSize[s];
  }
  const position = new Int32Array(n);
  order.forEach((v, k) => (position[v] = k));
  for (let r = 0; r < n; r++) {
    for (let q = matrix.rowStart[r]; q < matrix.rowStart[r + 1]; q++) {
      const a = supernodeOf[Math.min(position[r], position[matrix.column[q]])];
      const b = supernodeOf[Math.max(position[r], position[matrix.column[q]])];
      let s = a;
      while (s !== b && s !== -1) s = tree.parent[s];
      if (s === -1) return `entry (${r}, ${matrix.column[q]}) joins supernode ${a} to ${b}, not an ancestor`;
    }
  }
  return '';
}

function childCounts(tree: SupernodeTree): number[] {
  const count = new Array<number>(tree.count).fill(0);
  for (let s = 0; s < tree.count; s++) if (tree.parent[s] >= 0) count[tree.parent[s]]++;
  return count;
}

function ordered(c: SparseCase, points: Points | null, leafSize: number): { matrix: SymmetricCsr; order: Int32Array; tree: SupernodeTree } {
  const matrix = accumulate(new SymmetricSparseAccumulator(), c, uniformStream(c.n));
  const order = new Int32Array(c.n);
  const tree = new NestedDissection(leafSize).order(matrix, planePoints(points), denseTail(c), order);
  return { matrix, order, tree };
}

describe('NestedDissection', () => {
  it('gives a permutation and a post-ordered tree in which every entry joins a supernode to an ancestor, from coordinates', () => {
    for (const g of geometricCases()) {
      for (const leafSize of [1, 8, 64]) {
        const name = `${g.matrix.name}, leaves of ${leafSize}`;
        const { matrix, order, tree } = ordered(g.matrix, g.points, leafSize);
        expect(treeProblem(matrix, order, tree), name).toBe('');
        const children = childCounts(tree);
        const tail = denseTail(g.matrix).length;
        for (let s = 0; s < tree.count; s++) {
          const width = tree.start[s + 1] - tree.start[s];
          if (children[s] === 0 && tree.parent[s] !== -1) expect(width, `${name}: leaf ${s}`).toBeLessThanOrEqual(leafSize);
          if (tree.parent[s] === -1) expect(width - tail, `${name}: root ${s}`).toBeGreaterThan(0);
        }
        if (leafSize < g.matrix.n) expect(tree.count, `${name}: dissected`).toBeGreaterThan(2);
      }
    }
  });

  it('does the same from the graph alone, on every test pattern (level structures)', () => {
    for (const c of spdCases()) {
      for (const leafSize of [1, 4, 32]) {
        const { matrix, order, tree } = ordered(c, null, leafSize);
        expect(treeProblem(matrix, order, tree), `${c.name}, leaves of ${leafSize}`).toBe('');
      }
    }
  });

  it('numbers the dense rows last, in the one root supernode with the first separator', () => {
    for (const [c, points] of [[geometricCases()[0].matrix, geometricCases()[0].points], [spdCases()[7], null]] as [SparseCase, Points | null][]) {
      const tail = denseTail(c);
      expect(tail.length).toBeGreaterThan(0);
      const { order, tree } = ordered(c, points, 16);
      expect(Array.from(order.subarray(c.n - tail.length)), c.name).toEqual(tail);
      const roots = Array.from({ length: tree.count }, (_, s) => s).filter((s) => tree.parent[s] === -1);
      expect(roots, c.name).toEqual([tree.count - 1]);
      expect(tree.start[tree.count] - tree.start[tree.count - 1], c.name).toBeGreaterThan(tail.length);
    }
  });

  it('leaves two pieces cut apart with no edge between them as two trees, without dense rows', () => {
    const g = geometricCases()[2];
    const { matrix, order, tree } = ordered(g.matrix, g.points, 16);
    expect(treeProblem(matrix, order, tree)).toBe('');
    const roots = Array.from({ length: tree.count }, (_, s) => s).filter((s) => tree.parent[s] === -1);
    expect(roots.length).toBe(2);
  });

  it('handles 0 and 1 unknowns, and rejects a repeated or out-of-range root entry', () => {
    const nd = new NestedDissection();
    const empty = accumulate(new SymmetricSparseAccumulator(), { name: 'empty', n: 0, rows: [], columns: [], values: [] }, uniformStream(1));
    expect(nd.order(empty, null, [], new Int32Array(0)).count).toBe(0);
    const single = accumulate(new SymmetricSparseAccumulator(), { name: 'single', n: 1, rows: [0], columns: [0], values: [2] }, uniformStream(1));
    const tree = nd.order(single, { x: [0], y: [0], count: 1 }, [], new Int32Array(1));
    expect([tree.count, tree.start[1], tree.parent[0]]).toEqual([1, 1, -1]);
    const onlyRoot = nd.order(single, null, [0], new Int32Array(1));
    expect([onlyRoot.count, onlyRoot.start[1]]).toEqual([1, 1]);
    const c = spdCases()[7];
    const matrix = accumulate(new SymmetricSparseAccumulator(), c, uniformStream(2));
    expect(() => nd.order(matrix, null, [299, 299], new Int32Array(c.n))).toThrow(RangeError);
    expect(() => nd.order(matrix, null, [300], new Int32Array(c.n))).toThrow(RangeError);
    expect(() => new NestedDissection(0)).toThrow(RangeError);
  });
});
