import { describe, expect, it } from 'vitest';
import { DenseCholesky } from '../../../src/numeric/sparse/denseCholesky.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import { denseSolve, factorCase, newKernel, randomVector, relativeDifference } from './factorCase.js';
import { factorMultifrontal, newMultifrontalKernel } from './multifrontalCase.js';
import { accumulate, denseOf, spdCases, uniformStream, type SparseCase } from './sparseTestMatrices.js';

// The two halves of a solve: forwardSolve returns b^T A^-1 b as y^T y with L y = P b (A = P^T L
// L^T P: b^T A^-1 b = (L^-1 P b)^T (L^-1 P b), common practice), and backSolve then gives
// A^-1 b. Reference: ml-matrix's CholeskyDecomposition of the dense matrix (a general-purpose
// library from the npm registry), b^T A^-1 b as b . x with its x. Tolerance 1e-10 relative, as
// in envelopeCholesky.test.ts (cond(A) < 1e3 on these cases, n <= 300).
const TOLERANCE = 1e-10;

interface HalfSolver {
  solve(b: Float64Array, x: Float64Array): void;
  forwardSolve(b: Float64Array): number;
  backSolve(x: Float64Array): void;
}

/** The three factorisations of one case, each factored and ready to solve. */
function factored(c: SparseCase, u: () => number): { name: string; solver: HalfSolver }[] {
  const envelope = newKernel();
  factorCase(envelope, c, u);
  const multifrontal = newMultifrontalKernel(8);
  factorMultifrontal(multifrontal, c, u);
  const dense = new DenseCholesky();
  dense.factor(accumulate(new SymmetricSparseAccumulator(), c, u));
  return [
    { name: 'envelope', solver: envelope.cholesky },
    { name: 'multifrontal', solver: multifrontal.cholesky },
    { name: 'dense', solver: dense },
  ];
}

describe('forwardSolve and backSolve', () => {
  it('give b^T A^-1 b and A^-1 b of ml-matrix for every factorisation', () => {
    const u = uniformStream(71);
    for (const c of spdCases()) {
      const b = randomVector(c.n, u);
      const reference = denseSolve(denseOf(c), b);
      let quadraticReference = 0;
      for (let i = 0; i < c.n; i++) quadraticReference += b[i] * reference[i];
      for (const { name, solver } of factored(c, u)) {
        const quadratic = solver.forwardSolve(b);
        expect(Math.abs(quadratic - quadraticReference), `${c.name}, ${name}: b^T A^-1 b`).toBeLessThanOrEqual(TOLERANCE * Math.abs(quadraticReference));
        const x = new Float64Array(c.n);
        solver.backSolve(x);
        expect(relativeDifference(x, reference), `${c.name}, ${name}: A^-1 b`).toBeLessThanOrEqual(TOLERANCE);
        // Bit for bit what solve gives: the same two substitutions.
        const whole = new Float64Array(c.n);
        solver.solve(b, whole);
        expect(Array.from(x), `${c.name}, ${name}: solve`).toEqual(Array.from(whole));
      }
    }
  });
});
