import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { simdKernelsOf } from '../../../src/numeric/sparse/simdTileKernels.js';
import { symmetricRankUpdate } from '../../../src/numeric/sparse/symmetricRankUpdate.js';
import { ALLOCATORS, blockOf, randomDense, UNIT_ROUNDOFF } from './denseFronts.js';
import { uniformStream } from './sparseTestMatrices.js';

// Reference: C - P P^T by ml-matrix's mmul. Tolerance per entry: a sum of `width` products
// computed in any order lies within gamma_width (|P| |P|^T)_ij of the exact value, gamma_k =
// k u / (1 - k u) (Higham 2002, "Accuracy and Stability of Numerical Algorithms", eq. 3.5, from
// memory); ours and the reference each, plus one rounding of the subtraction from C.
describe('symmetricRankUpdate', () => {
  it('runs in WebAssembly SIMD on Node 20 for an array from ensureSimdFloat64Capacity', () => {
    expect(simdKernelsOf(ALLOCATORS.simd(16))).toBeDefined();
    expect(simdKernelsOf(ALLOCATORS.plain(16))).toBeUndefined();
  });

  it.each(Object.keys(ALLOCATORS) as Array<keyof typeof ALLOCATORS>)('subtracts P P^T from the lower triangle of C, any size and width, touching nothing else (%s array)', (kind) => {
    const allocate = ALLOCATORS[kind];
    const u = uniformStream(41);
    for (const [size, width] of [[1, 1], [2, 3], [3, 1], [4, 4], [5, 2], [7, 9], [8, 64], [37, 5], [64, 64], [130, 70]]) {
      const panel = 2;
      const first = panel + width + 1;
      const ld = first + size + 3;
      // Everything the update may not read or write is NaN: a stray read would spread into C.
      const a = allocate(ld * ld).fill(Number.NaN);
      const p = randomDense(size, width, u);
      const c = randomDense(size, size, u);
      for (let j = 0; j < width; j++) for (let i = 0; i < size; i++) a[(panel + j) * ld + first + i] = p.get(i, j);
      for (let j = 0; j < size; j++) for (let i = j; i < size; i++) a[(first + j) * ld + first + i] = c.get(i, j);
      symmetricRankUpdate(a, ld, first, size, panel, width);
      const expected = Matrix.sub(c, p.mmul(p.transpose()));
      const magnitude = Matrix.abs(p).mmul(Matrix.abs(p).transpose());
      const gamma = (width * UNIT_ROUNDOFF) / (1 - width * UNIT_ROUNDOFF);
      const result = blockOf(a, ld, first, first, size, size);
      for (let j = 0; j < size; j++) {
        for (let i = j; i < size; i++) {
          const bound = 2 * gamma * magnitude.get(i, j) + UNIT_ROUNDOFF * Math.abs(expected.get(i, j));
          expect(Math.abs(result.get(i, j) - expected.get(i, j)), `${size} x ${width} at (${i}, ${j})`).toBeLessThanOrEqual(bound);
        }
        for (let i = 0; i < j; i++) expect(result.get(i, j), `${size} x ${width} above the diagonal`).toBeNaN();
      }
      expect(Matrix.sub(blockOf(a, ld, first, panel, size, width), p).abs().max(), 'panel unchanged').toBe(0);
    }
  });

  it('gives the same bits in SIMD as in JavaScript (each lane sums in the same order)', () => {
    const u = uniformStream(43);
    for (const [size, width, first] of [[4, 1, 3], [9, 7, 10], [6, 5, 6], [64, 64, 64], [131, 33, 40], [66, 32, 33], [3, 2, 2]]) {
      const ld = first + size + 1;
      const plain = Float64Array.from({ length: ld * ld }, () => u() - 0.5);
      const simd = ALLOCATORS.simd(ld * ld);
      simd.set(plain);
      symmetricRankUpdate(plain, ld, first, size, first - width, width);
      symmetricRankUpdate(simd, ld, first, size, first - width, width);
      expect(Array.from(simd), `${size} x ${width}`).toEqual(Array.from(plain));
    }
  });

  it('does nothing for an empty block or an empty panel', () => {
    const a = Float64Array.from({ length: 16 }, (_, t) => t);
    symmetricRankUpdate(a, 4, 1, 0, 0, 1);
    symmetricRankUpdate(a, 4, 1, 3, 0, 0);
    expect(Array.from(a)).toEqual(Array.from({ length: 16 }, (_, t) => t));
  });
});
