import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { MultifrontalCholesky } from '../../../src/numeric/sparse/multifrontalCholesky.js';
import { ReverseCuthillMcKee } from '../../../src/numeric/sparse/reverseCuthillMcKee.js';
import { SupernodeChain } from '../../../src/numeric/sparse/supernodeChain.js';
import type { SupernodeTree } from '../../../src/numeric/sparse/supernodeTree.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import { denseLogDet, denseSolve, emptyMatrix, expectSameSolutions, expectSpoiledMatricesFail, gershgorinConditionBound, randomVector, relativeDifference } from './factorCase.js';
import { factorMultifrontal, newMultifrontalKernel } from './multifrontalCase.js';
import { patternOf, scipyCases } from './rcmTestTools.js';
import {
  accumulate, denseOf, denseTail, dominantCase, geometricCases, gridEdges, laplacianCase, localEdges, shuffled, spdCases, uniformStream, type SparseCase,
} from './sparseTestMatrices.js';

// Reference: ml-matrix's CholeskyDecomposition of the dense matrix. Tolerance 1e-10 relative,
// for the reason given in envelopeCholesky.test.ts: Cholesky is backward stable, so with
// cond(A) < 1e3 (Gershgorin's bound, checked below) and n <= 302 each solution lies within
// ~3e-11 of the exact one; ln det compared relative to max(1, |ln det|).
const TOLERANCE = 1e-10;

/** A supernode tree from explicit ranges and parents. */
function treeOf(start: number[], parent: number[]): SupernodeTree {
  return { count: parent.length, start: Int32Array.from(start), parent: Int32Array.from(parent) };
}

/** A chain of supernodes with the given widths, each the child of the next. */
function chainOf(widths: number[]): SupernodeTree {
  const start = [0];
  for (const w of widths) start.push(start[start.length - 1] + w);
  return treeOf(start, widths.map((_, s) => (s + 1 < widths.length ? s + 1 : -1)));
}

/** ln det and solution of the factor against ml-matrix's. */
function expectAgreement(cholesky: MultifrontalCholesky, c: SparseCase, logDet: number, uniform: () => number, name: string, tolerance = TOLERANCE): void {
  const dense = denseOf(c);
  const reference = denseLogDet(dense);
  expect(Math.abs(logDet - reference), `${name}: ln det`).toBeLessThanOrEqual(tolerance * Math.max(1, Math.abs(reference)));
  const b = randomVector(c.n, uniform);
  const x = new Float64Array(c.n);
  cholesky.solve(b, x);
  expect(relativeDifference(x, denseSolve(dense, b)), `${name}: solve`).toBeLessThan(tolerance);
  cholesky.solve(b, b);
  expect(Array.from(b), `${name}: in place`).toEqual(Array.from(x));
}

/**
 * From ml-matrix's Cholesky factor of the matrix permuted by `order`: the elimination tree
 * (parent[j] = least i > j with L_ij != 0, or -1), the nonzeros of L and sum_j (nonzeros of
 * column j)^2.
 */
function lowerStructure(dense: Matrix, order: number[]): { parent: number[]; nonzeros: number; operations: number } {
  const n = order.length;
  const permuted = Matrix.zeros(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) permuted.set(i, j, dense.get(order[i], order[j]));
  const l = new CholeskyDecomposition(permuted).lowerTriangularMatrix;
  const parent: number[] = [];
  let nonzeros = 0;
  let operations = 0;
  for (let j = 0; j < n; j++) {
    let count = 0;
    let first = -1;
    for (let i = j; i < n; i++) {
      if (l.get(i, j) === 0) continue;
      count++;
      if (i > j && first < 0) first = i;
    }
    parent.push(first);
    nonzeros += count;
    operations += count * count;
  }
  return { parent, nonzeros, operations };
}

/** A post-order of the forest given by parent links (children in increasing order, roots likewise). */
function postOrder(parent: number[]): number[] {
  const children: number[][] = parent.map(() => []);
  const roots: number[] = [];
  parent.forEach((p, j) => (p < 0 ? roots : children[p]).push(j));
  const out: number[] = [];
  const visit = (j: number): void => {
    for (const c of children[j]) visit(c);
    out.push(j);
  };
  for (const r of roots) visit(r);
  return out;
}

describe('MultifrontalCholesky', () => {
  it('the geometric test matrices are well conditioned (cond < 1e3), as the tolerance assumes', () => {
    for (const g of geometricCases()) expect(gershgorinConditionBound(denseOf(g.matrix)), g.matrix.name).toBeLessThan(1e3);
  });

  it('gives ln det A and the solution of A x = b of ml-matrix on every test pattern, in nested-dissection order', () => {
    const u = uniformStream(51);
    for (const leafSize of [4, 64]) {
      for (const c of spdCases()) {
        const kernel = newMultifrontalKernel(leafSize);
        const { logDet } = factorMultifrontal(kernel, c, u);
        expectAgreement(kernel.cholesky, c, logDet, u, `${c.name}, leaves of ${leafSize}`);
      }
      for (const g of geometricCases()) {
        const kernel = newMultifrontalKernel(leafSize);
        const { logDet } = factorMultifrontal(kernel, g.matrix, u, g.points);
        expectAgreement(kernel.cholesky, g.matrix, logDet, u, `${g.matrix.name}, leaves of ${leafSize}`);
      }
    }
  });

  it('agrees to 2 n u cond(A) on a poorly conditioned grid Laplacian (cond < 8e4)', () => {
    // As in envelopeCholesky.test.ts: cond < 8.0001 / 1e-4 (Gershgorin), n = 100.
    const u = uniformStream(52);
    const c = laplacianCase('grid Laplacian 10 x 10 + 1e-4 I', 10, 1e-4, shuffled(100, u));
    const tolerance = 2 * c.n * 1.1e-16 * gershgorinConditionBound(denseOf(c));
    const kernel = newMultifrontalKernel(8);
    const { logDet } = factorMultifrontal(kernel, c, u);
    expectAgreement(kernel.cholesky, c, logDet, u, c.name, tolerance);
  });

  it('factors over any tree that fits: one supernode, a chain of single columns, uneven blocks in a random order, a chain over RCM', () => {
    const u = uniformStream(53);
    for (const c of [spdCases()[3], spdCases()[6], geometricCases()[0].matrix]) {
      const m = accumulate(new SymmetricSparseAccumulator(), c, u);
      const natural = Int32Array.from({ length: c.n }, (_, i) => i);
      const widths: number[] = [];
      for (let left = c.n; left > 0; left -= widths[widths.length - 1]) widths.push(Math.min(left, 1 + Math.floor(20 * u())));
      const rcm = new ReverseCuthillMcKee().order(m, new Int32Array(c.n), denseTail(c));
      const cases: [string, Int32Array, SupernodeTree][] = [
        ['one supernode', natural, chainOf([c.n])],
        ['single columns', natural, chainOf(Array.from({ length: c.n }, () => 1))],
        ['uneven blocks, shuffled', Int32Array.from(shuffled(c.n, u)), chainOf(widths)],
        ['chain of 16 over RCM', rcm, new SupernodeChain().build(c.n, 16)],
      ];
      for (const [name, order, tree] of cases) {
        const cholesky = new MultifrontalCholesky();
        cholesky.analyse(m, order, tree);
        expectAgreement(cholesky, c, cholesky.factor(m), u, `${c.name}: ${name}`);
      }
    }
  });

  it("finds the exact structure of ml-matrix's L over the elimination tree, one column per supernode", () => {
    // A structural zero of L comes out of ml-matrix's dense Cholesky as an exact 0 (every product
    // in its sums has a zero factor), and a structural nonzero of random values is not 0. The
    // elimination tree (parent of column j: the first row below j with L_ij != 0) is read off
    // that L, post-ordered (which leaves the fill unchanged, Liu 1990, SIAM J. Matrix Anal. Appl.
    // 11, 134), and given with single-column supernodes: then the multifrontal structure is the
    // exact fill, entry for entry, and the operation count sum_j (nonzeros of column j)^2.
    const u = uniformStream(54);
    for (const c of [spdCases()[4], spdCases()[7], spdCases()[8], geometricCases()[1].matrix]) {
      const m = accumulate(new SymmetricSparseAccumulator(), c, u);
      const dense = denseOf(c);
      const shuffledOrder = shuffled(c.n, u);
      const { parent } = lowerStructure(dense, shuffledOrder);
      const post = postOrder(parent);
      const order = Int32Array.from(post, (j) => shuffledOrder[j]);
      const position = new Int32Array(c.n);
      post.forEach((j, k) => (position[j] = k));
      const tree = treeOf(Array.from({ length: c.n + 1 }, (_, k) => k), post.map((j) => (parent[j] < 0 ? -1 : position[parent[j]])));
      const reference = lowerStructure(dense, Array.from(order));
      const cholesky = new MultifrontalCholesky();
      expect(cholesky.analyse(m, order, tree), c.name).toBe(reference.nonzeros);
      expect(cholesky.flops, c.name).toBe(reference.operations);
      expectAgreement(cholesky, c, cholesky.factor(m), u, `${c.name}: elimination tree`);
    }
  });

  it("keeps the profile measured by scipy's fixture script, plus the diagonal, over a chain of single columns", () => {
    // A chain passes every column's structure on to the next: the structure is the envelope.
    const cholesky = new MultifrontalCholesky();
    for (const c of scipyCases) {
      const entries = cholesky.analyse(patternOf(c), Int32Array.from(c.scipyOrder), chainOf(Array.from({ length: c.n }, () => 1)));
      expect(entries, c.name).toBe(c.scipyProfile + c.n);
    }
  });

  it('counts n(n + 1) / 2 entries and n(n + 1)(2n + 1) / 6 operations for a dense matrix (common practice)', () => {
    const u = uniformStream(58);
    const n = 37;
    const full = dominantCase('dense 37', n, Array.from({ length: n }, (_, i) => Array.from({ length: i }, (_, j) => [i, j] as [number, number])).flat(), u);
    const cholesky = new MultifrontalCholesky();
    cholesky.analyse(accumulate(new SymmetricSparseAccumulator(), full, u), Int32Array.from({ length: n }, (_, i) => i), chainOf([10, 27]));
    expect(cholesky.factorEntries).toBe((n * (n + 1)) / 2);
    expect(cholesky.flops).toBe((n * (n + 1) * (2 * n + 1)) / 6);
  });

  it('returns NaN without throwing for a negative pivot early or late, a zero matrix and a NaN entry', () => {
    const u = uniformStream(55);
    const g = geometricCases()[0];
    const kernel = newMultifrontalKernel(16);
    const { order } = factorMultifrontal(kernel, g.matrix, u, g.points);
    expectSpoiledMatricesFail(kernel.cholesky, () => accumulate(kernel.accumulator, g.matrix, u), order);
  });

  it('refactors new values on the same pattern without a new analysis', () => {
    const u = uniformStream(56);
    const k = 14;
    const edges = [...gridEdges(k, shuffled(k * k, u)), ...localEdges(k * k, 3, 0.2, u)];
    const kernel = newMultifrontalKernel(8);
    for (let round = 0; round < 4; round++) {
      const c = dominantCase(`round ${round}`, k * k, edges, u, 0.3 + round);
      if (round === 0) {
        factorMultifrontal(kernel, c, u);
        continue;
      }
      const m = accumulate(kernel.accumulator, c, u);
      expectAgreement(kernel.cholesky, c, kernel.cholesky.factor(m), u, c.name);
    }
  });

  it('throws for a pattern other than the one analysed, a non-permutation, a tree out of post-order or not fitting the pattern', () => {
    const u = uniformStream(57);
    const path = dominantCase('path', 4, [[1, 0], [2, 1], [3, 2]], u);
    const m = accumulate(new SymmetricSparseAccumulator(), path, u);
    const natural = Int32Array.from([0, 1, 2, 3]);
    const cholesky = new MultifrontalCholesky();
    cholesky.analyse(m, natural, chainOf([2, 2]));
    const wider = dominantCase('wider', 4, [[1, 0], [2, 1], [3, 2], [3, 0]], u);
    expect(() => cholesky.factor(accumulate(new SymmetricSparseAccumulator(), wider, u))).toThrow(/pattern differs/);
    expect(() => cholesky.analyse(m, Int32Array.from([0, 1, 1, 3]), chainOf([4]))).toThrow(RangeError);
    // Supernode 2's subtree {0, 2} skips supernode 1: not a post-order.
    expect(() => cholesky.analyse(m, natural, treeOf([0, 1, 2, 4], [2, -1, -1]))).toThrow(/post-order/);
    expect(() => cholesky.analyse(m, natural, treeOf([0, 1, 1, 4], [2, 2, -1]))).toThrow(RangeError);
    expect(() => cholesky.analyse(m, natural, treeOf([0, 2, 4], [0, -1]))).toThrow(RangeError);
    // Edge (1, 0) joins the sibling leaves {0} and {1}; no factor follows a failed analysis.
    expect(() => cholesky.analyse(m, natural, treeOf([0, 1, 2, 4], [2, 2, -1]))).toThrow(/does not fit/);
    expect(() => cholesky.factor(m)).toThrow(/call analyse first/);
  });

  it('gives the same results when one instance is reused across sizes as fresh ones, and keeps its buffers', () => {
    const cases = [...spdCases(), ...geometricCases().map((g) => g.matrix)];
    const reused = newMultifrontalKernel(16);
    factorMultifrontal(reused, cases[10], uniformStream(1), geometricCases()[0].points);
    const before = [reused.cholesky.lower, reused.cholesky.rowIndex, reused.cholesky.supernodeStart, reused.cholesky.order];
    for (const c of [cases[6], cases[0], cases[4], cases[9], cases[7], cases[1], cases[8]]) {
      const a = factorMultifrontal(reused, c, uniformStream(c.n));
      const fresh = newMultifrontalKernel(16);
      const b = factorMultifrontal(fresh, c, uniformStream(c.n));
      expect(a.logDet, c.name).toBe(b.logDet);
      expectSameSolutions(reused.cholesky, fresh.cholesky, c.n, c.name);
      const after = [reused.cholesky.lower, reused.cholesky.rowIndex, reused.cholesky.supernodeStart, reused.cholesky.order];
      after.forEach((buffer, t) => expect(buffer === before[t], `${c.name}: buffer ${t}`).toBe(true));
    }
  });

  it('gives the same factor from analyseAndFactor as from analyse and factor', () => {
    const u = uniformStream(59);
    for (const g of geometricCases()) {
      const kernel = newMultifrontalKernel(16);
      const { matrix, tree, order, logDet } = factorMultifrontal(kernel, g.matrix, u, g.points);
      const together = new MultifrontalCholesky();
      expect(together.analyseAndFactor(matrix, order, tree), g.matrix.name).toBe(logDet);
      const entries = together.factorStart[together.supernodeCount];
      expect(Array.from(together.lower.subarray(0, entries)), g.matrix.name).toEqual(Array.from(kernel.cholesky.lower.subarray(0, entries)));
      expectSameSolutions(together, kernel.cholesky, g.matrix.n, g.matrix.name);
    }
  });

  it('handles an empty matrix: ln det 0', () => {
    const m = emptyMatrix();
    const cholesky = new MultifrontalCholesky();
    expect(cholesky.analyse(m, new Int32Array(0), treeOf([0], []))).toBe(0);
    expect(cholesky.factor(m)).toBe(0);
  });
});
