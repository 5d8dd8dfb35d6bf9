// Tests of src/numeric/linearAlgebra/weightedNormalEquations.ts and its WebAssembly SIMD twin
// simdNormalEquations.ts: against ml-matrix (a general-purpose linear-algebra library from the
// npm registry), and against each other bit for bit.
import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { SimdNormalEquations, SIMD_NORMAL_EQUATIONS_AVAILABLE } from '../../../src/numeric/linearAlgebra/simdNormalEquations.js';
import { weightedNormalEquations } from '../../../src/numeric/linearAlgebra/weightedNormalEquations.js';
import { UNIT_ROUNDOFF } from '../sparse/denseFronts.js';
import { uniformStream } from '../sparse/sparseTestMatrices.js';

interface Problem {
  readonly k: number;
  readonly n: number;
  readonly basis: Float64Array;
  readonly w: Float64Array;
  readonly d: Float64Array;
}

function randomProblem(k: number, n: number, u: () => number): Problem {
  return {
    k, n,
    basis: Float64Array.from({ length: k * n }, () => u() - 0.4),
    w: Float64Array.from({ length: n }, () => 0.2 + 3 * u()),
    d: Float64Array.from({ length: n }, () => 2 * u() - 1),
  };
}

type Assemble = (p: Problem, normal: Float64Array, rhs: Float64Array) => void;

const plainJavaScript: Assemble = (p, normal, rhs) => weightedNormalEquations(p.basis, p.k, p.n, p.w, p.d, normal, rhs, new Float64Array(p.n));

function simdAssemble(equations = new SimdNormalEquations()): Assemble {
  return (p, normal, rhs) => equations.assemble(p.basis, p.k, p.n, p.w, p.d, normal, rhs);
}

/** The lower triangle of `normal` and all of `rhs`, as one list. */
function results(p: Problem, assemble: Assemble): number[] {
  const normal = new Float64Array(p.k * p.k);
  const rhs = new Float64Array(p.k);
  assemble(p, normal, rhs);
  const out: number[] = [];
  for (let a = 0; a < p.k; a++) for (let c = 0; c <= a; c++) out.push(normal[a * p.k + c]);
  return [...out, ...rhs];
}

/** A copy of `values` in a WebAssembly memory, `lead` values after the start of its buffer. */
function inWasmMemory(values: Float64Array, lead: number): Float64Array {
  const memory = new WebAssembly.Memory({ initial: Math.ceil((8 * (values.length + lead)) / 65536) + 1 });
  const view = new Float64Array(memory.buffer, 8 * lead, values.length);
  view.set(values);
  return view;
}

const SHAPES: ReadonlyArray<readonly [number, number]> = [[1, 1], [1, 2], [3, 1], [2, 5], [4, 8], [5, 9], [7, 31], [12, 64], [13, 101]];

describe('weighted normal equations', () => {
  // Reference: B^T W B and B^T W d by ml-matrix's mmul with W = diag(w). Each of our entries is
  // a sum of n products of three factors, so it lies within gamma_(n+1) (|B|^T W |B|)_pq (or
  // (|B|^T W |d|)_p) of the exact value whatever the order of the sum (Higham 2002, "Accuracy and
  // Stability of Numerical Algorithms", sec. 3.1, eq. 3.5 and lemma 3.1); the same holds for
  // ml-matrix's products, so the two differ by at most twice that.
  it.each([['the JavaScript loop', plainJavaScript], ['the SIMD kernel', simdAssemble()]] as const)('%s gives ml-matrix\'s B^T W B and B^T W d', (_, assemble) => {
    const u = uniformStream(61);
    for (const [k, n] of SHAPES) {
      const p = randomProblem(k, n, u);
      const normal = new Float64Array(k * k);
      const rhs = new Float64Array(k);
      assemble(p, normal, rhs);
      const b = new Matrix(n, k);
      for (let q = 0; q < k; q++) for (let i = 0; i < n; i++) b.set(i, q, p.basis[q * n + i]);
      const weights = Matrix.diag(Array.from(p.w));
      const d = Matrix.columnVector(Array.from(p.d));
      const expectedNormal = b.transpose().mmul(weights).mmul(b);
      const expectedRhs = b.transpose().mmul(weights).mmul(d);
      const magnitudeNormal = Matrix.abs(b).transpose().mmul(weights).mmul(Matrix.abs(b));
      const magnitudeRhs = Matrix.abs(b).transpose().mmul(weights).mmul(Matrix.abs(d));
      const gamma = ((n + 1) * UNIT_ROUNDOFF) / (1 - (n + 1) * UNIT_ROUNDOFF);
      for (let a = 0; a < k; a++) {
        for (let c = 0; c <= a; c++) {
          expect(Math.abs(normal[a * k + c] - expectedNormal.get(a, c)), `${k} x ${n}: A(${a}, ${c})`).toBeLessThanOrEqual(2 * gamma * magnitudeNormal.get(a, c));
        }
        expect(Math.abs(rhs[a] - expectedRhs.get(a, 0)), `${k} x ${n}: b(${a})`).toBeLessThanOrEqual(2 * gamma * magnitudeRhs.get(a, 0));
      }
    }
  });

  it('runs the WebAssembly SIMD kernel on Node 20 (so the comparisons below compare two programs)', () => {
    // Node 20's V8 (11.3) compiles fixed-width SIMD, enabled since V8 9.1.
    expect(SIMD_NORMAL_EQUATIONS_AVAILABLE).toBe(true);
  });

  it('gives the JavaScript loop\'s bits, on ordinary arrays and on arrays in a WebAssembly memory', () => {
    const u = uniformStream(62);
    const equations = new SimdNormalEquations();
    for (const [k, n] of [...SHAPES, [67, 517], [67, 516], [9, 1000]] as const) {
      const p = randomProblem(k, n, u);
      const expected = results(p, plainJavaScript);
      expect(results(p, simdAssemble(equations)), `${k} x ${n}, ordinary arrays`).toEqual(expected);
      const inMemory: Problem = { k, n, basis: inWasmMemory(p.basis, 3), w: inWasmMemory(p.w, 1), d: inWasmMemory(p.d, 0) };
      expect(results(inMemory, plainJavaScript), `${k} x ${n}, the loop on arrays in a memory`).toEqual(expected);
      expect(results(inMemory, simdAssemble(equations)), `${k} x ${n}, the kernel on arrays in a memory`).toEqual(expected);
    }
  });

  it('reads only the first k n basis values and n weights and data, and keeps nothing from the last call', () => {
    const u = uniformStream(63);
    const equations = new SimdNormalEquations();
    for (const [k, n] of [[6, 40], [6, 40], [3, 41], [6, 40]] as const) {
      const p = randomProblem(k, n, u);
      const expected = results(p, plainJavaScript);
      const longer = (a: Float64Array): Float64Array => Float64Array.from([...a, Number.NaN, 1e300]);
      const padded: Problem = { k, n, basis: longer(p.basis), w: longer(p.w), d: longer(p.d) };
      expect(results(padded, simdAssemble(equations)), `${k} x ${n}`).toEqual(expected);
      expect(results(p, simdAssemble(equations)), `${k} x ${n}, again`).toEqual(expected);
    }
  });
});
