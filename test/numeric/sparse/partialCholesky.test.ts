import { CholeskyDecomposition } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { partialCholesky, PARTIAL_CHOLESKY_BLOCK } from '../../../src/numeric/sparse/partialCholesky.js';
import { blockOf, columnMajor, dominantDense, lowerOf, matrixDifference, UNIT_ROUNDOFF } from './denseFronts.js';
import { uniformStream } from './sparseTestMatrices.js';

// Reference: ml-matrix's CholeskyDecomposition L of the whole front. Its first `columns`
// columns are those partialCholesky must leave, and the Schur complement it must leave in the
// trailing block is L22 L22^T. Tolerance 2 n u cond(A) (normwise, relative): Cholesky is
// backward stable (Higham 2002, theorem 10.3, from memory), so each factor lies within about
// n u cond(A) of the exact one, the two within twice that. The fronts are diagonally dominant
// with margin 1, so cond(A) < 2 n + 1 (Gershgorin).
describe('partialCholesky', () => {
  const u = uniformStream(43);
  const sizes: [number, number][] = [[1, 1], [3, 3], [5, 2], [6, 0], [17, 17], [70, 33], [131, 131], [150, 70], [129, PARTIAL_CHOLESKY_BLOCK + 1]];

  it('leaves the first columns of L and the Schur complement of ml-matrix, and 2 sum ln L_jj', () => {
    for (const [size, columns] of sizes) {
      const a = dominantDense(size, u, 1);
      const ld = size + 3;
      const front = columnMajor(a, ld);
      const logDet = partialCholesky(front, ld, size, columns);
      const l = new CholeskyDecomposition(a).lowerTriangularMatrix;
      const tolerance = 2 * size * UNIT_ROUNDOFF * (2 * size + 1);
      const name = `${size} x ${size}, ${columns} columns`;
      if (columns > 0) {
        const factored = blockOf(front, ld, 0, 0, size, columns);
        const reference = l.subMatrix(0, size - 1, 0, columns - 1);
        expect(matrixDifference(lowerOf(factored), lowerOf(reference)), name).toBeLessThan(tolerance);
      }
      if (columns < size) {
        const l22 = l.subMatrix(columns, size - 1, columns, size - 1);
        const schur = blockOf(front, ld, columns, columns, size - columns, size - columns);
        expect(matrixDifference(schur, l22.mmul(l22.transpose()), true), name).toBeLessThan(tolerance);
      }
      let reference = 0;
      for (let j = 0; j < columns; j++) reference += 2 * Math.log(l.get(j, j));
      expect(Math.abs(logDet - reference), name).toBeLessThanOrEqual(tolerance * Math.max(1, Math.abs(reference)));
    }
  });

  it('returns NaN for a pivot that is not positive among the columns factored, and only there', () => {
    const size = 90;
    const a = dominantDense(size, u, 1);
    a.set(70, 70, -1);
    expect(new CholeskyDecomposition(a).isPositiveDefinite()).toBe(false);
    const ld = size;
    expect(partialCholesky(columnMajor(a, ld), ld, size, size)).toBeNaN();
    expect(partialCholesky(columnMajor(a, ld), ld, size, 71)).toBeNaN();
    expect(partialCholesky(columnMajor(a, ld), ld, size, 70)).not.toBeNaN();
    const poisoned = a.clone();
    poisoned.set(3, 3, Number.NaN);
    expect(partialCholesky(columnMajor(poisoned, ld), ld, size, 10)).toBeNaN();
  });
});
