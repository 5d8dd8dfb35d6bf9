import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { panelTriangularSolve } from '../../../src/numeric/sparse/panelTriangularSolve.js';
import { ALLOCATORS, blockOf, dominantDense, randomDense, UNIT_ROUNDOFF } from './denseFronts.js';
import { uniformStream } from './sparseTestMatrices.js';

// Check: the residual B - X L^T, with X L^T formed by ml-matrix's mmul. A triangular solve by
// substitution is componentwise backward stable: each row x of the computed X satisfies
// x (L + dL)^T = b with |dL| <= gamma_w |L| (Higham 2002, "Accuracy and Stability of Numerical
// Algorithms", theorem 8.5, from memory), so |b - x L^T| <= gamma_w |x| |L|^T; the product in
// the reference adds at most as much again, and the subtraction one rounding of b.
describe('panelTriangularSolve', () => {
  it.each(Object.keys(ALLOCATORS) as Array<keyof typeof ALLOCATORS>)('solves X L^T = B for panels of any height and width, in place, the diagonal block unchanged (%s array)', (kind) => {
    const u = uniformStream(42);
    for (const [width, rows] of [[1, 1], [1, 6], [3, 2], [4, 4], [5, 9], [8, 3], [17, 33], [64, 70], [70, 130]]) {
      const l = new CholeskyDecomposition(dominantDense(width, u, 1)).lowerTriangularMatrix;
      const b = randomDense(rows, width, u);
      const diagonal = 3;
      const rowFrom = diagonal + width + 2;
      const ld = rowFrom + rows + 1;
      const a = ALLOCATORS[kind](ld * ld).fill(Number.NaN);
      for (let j = 0; j < width; j++) {
        for (let i = j; i < width; i++) a[(diagonal + j) * ld + diagonal + i] = l.get(i, j);
        for (let i = 0; i < rows; i++) a[(diagonal + j) * ld + rowFrom + i] = b.get(i, j);
      }
      panelTriangularSolve(a, ld, diagonal, width, rowFrom, rows);
      const x = blockOf(a, ld, rowFrom, diagonal, rows, width);
      const residual = Matrix.sub(b, x.mmul(l.transpose()));
      const magnitude = Matrix.abs(x).mmul(Matrix.abs(l).transpose());
      const gamma = (width * UNIT_ROUNDOFF) / (1 - width * UNIT_ROUNDOFF);
      for (let i = 0; i < rows; i++) {
        for (let j = 0; j < width; j++) {
          const bound = 2 * gamma * magnitude.get(i, j) + UNIT_ROUNDOFF * Math.abs(b.get(i, j));
          expect(Math.abs(residual.get(i, j)), `${rows} x ${width} at (${i}, ${j})`).toBeLessThanOrEqual(bound);
        }
      }
      for (let j = 0; j < width; j++) for (let i = j; i < width; i++) expect(a[(diagonal + j) * ld + diagonal + i]).toBe(l.get(i, j));
    }
  });

  it('gives the same bits in SIMD as in JavaScript (the same operations in the same order)', () => {
    const u = uniformStream(44);
    for (const [width, rows] of [[4, 4], [7, 13], [64, 70], [33, 129]]) {
      const l = new CholeskyDecomposition(dominantDense(width, u, 1)).lowerTriangularMatrix;
      const diagonal = 2;
      const rowFrom = diagonal + width + 1;
      const ld = rowFrom + rows;
      const plain = Float64Array.from({ length: ld * ld }, () => u() - 0.5);
      for (let j = 0; j < width; j++) for (let i = j; i < width; i++) plain[(diagonal + j) * ld + diagonal + i] = l.get(i, j);
      const simd = ALLOCATORS.simd(ld * ld);
      simd.set(plain);
      panelTriangularSolve(plain, ld, diagonal, width, rowFrom, rows);
      panelTriangularSolve(simd, ld, diagonal, width, rowFrom, rows);
      expect(Array.from(simd), `${rows} x ${width}`).toEqual(Array.from(plain));
    }
  });
});
