import { describe, expect, it } from 'vitest';
import { FrontMemory } from '../../../src/numeric/sparse/frontMemory.js';
import { extendAdd, relativeRuns } from '../../../src/numeric/sparse/frontOperations.js';
import { MultifrontalCholesky } from '../../../src/numeric/sparse/multifrontalCholesky.js';
import { NestedDissection } from '../../../src/numeric/sparse/nestedDissection.js';
import { ReverseCuthillMcKee } from '../../../src/numeric/sparse/reverseCuthillMcKee.js';
import { simdKernelsOf } from '../../../src/numeric/sparse/simdTileKernels.js';
import { SupernodeChain } from '../../../src/numeric/sparse/supernodeChain.js';
import type { SupernodeTree } from '../../../src/numeric/sparse/supernodeTree.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import { accumulate, denseTail, geometricCases, planePoints, spdCases, uniformStream } from './sparseTestMatrices.js';

// The WebAssembly extend-add against its JavaScript twin (frontOperations.ts), bit for bit: each
// front entry receives the same single addition in both, so any difference is a fault. The
// twin itself is checked against ml-matrix's dense Cholesky in multifrontalCholesky.test.ts.

/** m sorted distinct positions below `size` (size >= m). */
function positions(size: number, m: number, u: () => number): number[] {
  const chosen = new Set<number>();
  while (chosen.size < m) chosen.add(Math.floor(u() * size));
  return [...chosen].sort((a, b) => a - b);
}

function bits(a: Float64Array, length: number): string[] {
  return Array.from(a.subarray(0, length), (v) => Buffer.from(Float64Array.of(v).buffer).toString('hex'));
}

describe('FrontMemory', () => {
  it('binds the SIMD tile kernels to its fronts on Node 20, and not in the JavaScript twin', () => {
    const relative = new Int32Array(4);
    const kernel = new FrontMemory();
    kernel.prepare(64, 16, relative, relative, 4);
    expect(simdKernelsOf(kernel.frontEven)).toBeDefined();
    expect(simdKernelsOf(kernel.frontOdd)).toBe(simdKernelsOf(kernel.frontEven));
    const twin = new FrontMemory('javaScript');
    twin.prepare(64, 16, relative, relative, 4);
    expect(simdKernelsOf(twin.frontEven)).toBeUndefined();
  });

  it('adds an update into the front as the twin does, runs of any length, from the stack and from the other front', () => {
    const u = uniformStream(71);
    for (const [frontSize, m, spread] of [[1, 1, 1], [5, 3, 1], [9, 9, 1], [40, 13, 0.4], [64, 31, 0.9], [120, 77, 0.7], [200, 11, 0.05]]) {
      // The child's rows: the first m of a random set of positions, sparse or packed (runs of 1 to m).
      const rows = positions(Math.min(frontSize, Math.ceil(m / spread)), m, u);
      const from = 3;
      const relative = new Int32Array(from + m + 2);
      rows.forEach((p, k) => (relative[from + k] = p));
      const runEnd = new Int32Array(relative.length);
      relativeRuns(relative, runEnd, from, from + m);
      for (const source of ['stack', 'front'] as const) {
        const kernel = new FrontMemory();
        const twin = new FrontMemory('javaScript');
        const ld = source === 'stack' ? m : m + 5;
        const at = source === 'stack' ? 7 : 5 * (ld + 1);
        for (const memory of [kernel, twin]) memory.prepare(Math.max(frontSize * frontSize, at + ld * m), at + ld * m, relative, runEnd, relative.length);
        const front = new Float64Array(frontSize * frontSize).map(() => u() - 0.5);
        const update = new Float64Array(at + ld * m).map(() => u() - 0.5);
        const expected = front.slice();
        extendAdd(expected, frontSize, update, at, ld, m, relative, runEnd, from);
        for (const memory of [kernel, twin]) {
          const [target, held] = source === 'stack' ? [memory.frontEven, memory.stack] : [memory.frontEven, memory.frontOdd];
          target.set(front);
          held.set(update);
          memory.extendAdd(target, frontSize, held, at, ld, m, from);
          expect(bits(target, front.length), `${frontSize} x ${m}, ${source}, ${memory.engine}`).toEqual(bits(expected, front.length));
        }
      }
    }
  });

  it('gives MultifrontalCholesky the same factor to the bit as the twin, over separator trees (the stack) and chains', () => {
    const u = uniformStream(72);
    const cases: { name: string; matrix: ReturnType<typeof accumulate>; order: Int32Array; tree: SupernodeTree }[] = [];
    for (const g of geometricCases()) {
      const matrix = accumulate(new SymmetricSparseAccumulator(), g.matrix, u);
      const order = new Int32Array(g.matrix.n);
      const tree = new NestedDissection(8).order(matrix, planePoints(g.points), denseTail(g.matrix), order);
      cases.push({ name: `${g.matrix.name}, dissection`, matrix, order: order.slice(), tree: { count: tree.count, start: tree.start.slice(), parent: tree.parent.slice() } });
      const rcm = new ReverseCuthillMcKee().order(matrix, new Int32Array(g.matrix.n), denseTail(g.matrix)).slice();
      const chain = new SupernodeChain().build(g.matrix.n, 32);
      cases.push({ name: `${g.matrix.name}, chain`, matrix, order: rcm, tree: { count: chain.count, start: chain.start.slice(), parent: chain.parent.slice() } });
    }
    const big = spdCases()[8];
    const matrix = accumulate(new SymmetricSparseAccumulator(), big, u);
    const chain = new SupernodeChain().build(big.n, 7);
    cases.push({ name: `${big.name}, chain of 7`, matrix, order: Int32Array.from({ length: big.n }, (_, i) => i), tree: { count: chain.count, start: chain.start.slice(), parent: chain.parent.slice() } });
    let stacked = 0;
    for (const c of cases) {
      const kernel = new MultifrontalCholesky();
      const twin = new MultifrontalCholesky('javaScript');
      kernel.analyse(c.matrix, c.order, c.tree);
      twin.analyse(c.matrix, c.order, c.tree);
      const logDet = kernel.factor(c.matrix);
      expect(logDet, c.name).toBe(twin.factor(c.matrix));
      expect(Number.isFinite(logDet), c.name).toBe(true);
      const entries = kernel.factorStart[kernel.supernodeCount];
      expect(bits(kernel.lower, entries), c.name).toEqual(bits(twin.lower, entries));
      for (let s = 0; s < kernel.supernodeCount; s++) if (kernel.supernodeParent[s] >= 0 && kernel.supernodeParent[s] !== s + 1) stacked++;
    }
    // The separator trees put children on the stack, so both sources of an update were met.
    expect(stacked).toBeGreaterThan(10);
  });
});
