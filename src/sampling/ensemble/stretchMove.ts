import type { SeededStream } from '../../numeric/random/seededStream.js';

/** Draws z from g(z) proportional to 1/sqrt(z) on [1/a, a] by inverting its CDF. */
export function stretchFactor(random: SeededStream, a: number): number {
  const root = (a - 1) * random.uniform() + 1;
  return (root * root) / a;
}

// Affine-invariant stretch move (Goodman & Weare 2010, eq. 7 and 9): walker X_k moves to
// Y = X_j + z (X_k - X_j), X_j drawn from the complementary half, z ~ g(z) on [1/a, a]; the
// acceptance ratio carries z^(d-1), written here as the log correction (d - 1) log z.
// Walkers [first, first + count) propose; the complement is [other, other + otherCount).
export function proposeStretch(
  positions: Float64Array, dim: number,
  first: number, count: number, other: number, otherCount: number,
  random: SeededStream, a: number,
  proposals: Float64Array, logCorrection: Float64Array,
): void {
  for (let i = 0; i < count; i++) {
    const partner = other + random.integer(otherCount);
    const z = stretchFactor(random, a);
    const self = (first + i) * dim;
    const base = partner * dim;
    for (let d = 0; d < dim; d++) {
      proposals[i * dim + d] = positions[base + d] + z * (positions[self + d] - positions[base + d]);
    }
    logCorrection[i] = (dim - 1) * Math.log(z);
  }
}
