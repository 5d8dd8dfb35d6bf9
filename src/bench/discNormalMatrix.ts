import { SymmetricSparseAccumulator } from '../numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';

/** A synthetic normal matrix and the source-plane coordinates of its cells. */
export interface DiscNormalMatrix {
  readonly matrix: SymmetricCsr;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly cells: number;
}

/**
 * A matrix shaped like a pixelated source's posterior precision: `cells` points uniform in the
 * unit disc, each coupled to every point closer than sqrt(neighbours / cells) (the PSF's reach
 * in the source plane; about `neighbours` per row away from the rim), and `dense` amplitude rows
 * coupled to everything, numbered last. Values: exp(-2 d^2 / reach^2) times a uniform draw in
 * [0.5, 1), the diagonal their absolute row sum plus 0.1 (strictly dominant, so positive
 * definite).
 */
export function discNormalMatrix(cells: number, neighbours: number, dense: number, uniform: () => number): DiscNormalMatrix {
  const x = new Float64Array(cells);
  const y = new Float64Array(cells);
  for (let c = 0; c < cells; c++) {
    do {
      x[c] = 2 * uniform() - 1;
      y[c] = 2 * uniform() - 1;
    } while (x[c] * x[c] + y[c] * y[c] >= 1);
  }
  const n = cells + dense;
  const rowSum = new Float64Array(n);
  const accumulator = new SymmetricSparseAccumulator();
  accumulator.reset(n);
  addCouplings(accumulator, x, y, Math.sqrt(neighbours / cells), rowSum, uniform);
  for (let a = cells; a < n; a++) {
    for (let j = 0; j < a; j++) {
      const v = 0.1 * uniform();
      accumulator.add(a, j, v);
      rowSum[a] += v;
      rowSum[j] += v;
    }
  }
  for (let i = 0; i < n; i++) accumulator.add(i, i, rowSum[i] + 0.1);
  return { matrix: accumulator.compress(), x, y, cells };
}

function addCouplings(
  accumulator: SymmetricSparseAccumulator, x: Float64Array, y: Float64Array, reach: number, rowSum: Float64Array, uniform: () => number,
): void {
  for (let i = 0; i < x.length; i++) {
    for (let j = 0; j < i; j++) {
      const d2 = (x[i] - x[j]) ** 2 + (y[i] - y[j]) ** 2;
      if (d2 >= reach * reach) continue;
      const v = Math.exp((-2 * d2) / (reach * reach)) * (0.5 + 0.5 * uniform());
      accumulator.add(i, j, v);
      rowSum[i] += v;
      rowSum[j] += v;
    }
  }
}
