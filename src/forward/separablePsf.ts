import type { PsfKernel } from '../imaging/psfKernel.js';

/** K(a, b) ~ alongColumns[a] * alongRows[b]: a kernel as the outer product of two 1-D kernels. */
export interface SeparablePsf {
  /** Factor along x (one value per kernel column). */
  readonly alongX: Float64Array;
  /** Factor along y (one value per kernel row). */
  readonly alongY: Float64Array;
  /** sum |K - alongX alongY^T| over the kernel, as a fraction of sum |K|. */
  readonly residualFraction: number;
}

/**
 * The rank-1 factorisation of a kernel from its marginals: for K = u v^T exactly, the row sums
 * are u (sum v) and the column sums v (sum u), so u_a = sum_b K(a, b), v_b = sum_a K(a, b) / sum K
 * reproduce it (a circular Gaussian sampled on a square grid is exactly separable; common
 * practice). Returned only when the residual is at most `budget` of sum |K|: a separable
 * convolution then differs from the full one by at most residualFraction * sum |K| * max |image|.
 */
export function separablePsf(kernel: PsfKernel, budget: number): SeparablePsf | undefined {
  const { columns, rows, values } = kernel;
  const alongX = new Float64Array(columns);
  const alongY = new Float64Array(rows);
  let total = 0;
  let totalAbs = 0;
  for (let b = 0; b < rows; b++) {
    for (let a = 0; a < columns; a++) {
      const value = values[b * columns + a];
      alongX[a] += value;
      alongY[b] += value;
      total += value;
      totalAbs += Math.abs(value);
    }
  }
  if (!(total > 0)) return undefined;
  for (let b = 0; b < rows; b++) alongY[b] /= total;
  let residual = 0;
  for (let b = 0; b < rows; b++) {
    for (let a = 0; a < columns; a++) residual += Math.abs(values[b * columns + a] - alongX[a] * alongY[b]);
  }
  const residualFraction = residual / totalAbs;
  return residualFraction <= budget ? { alongX, alongY, residualFraction } : undefined;
}
