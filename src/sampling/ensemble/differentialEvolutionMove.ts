import type { SeededStream } from '../../numeric/random/seededStream.js';

// Differential-evolution move (ter Braak 2006, eq. 2): Y = X_i + gamma (X_j - X_k) + e with j != k
// drawn from the complementary half, gamma = 2.38 / sqrt(2 d) by default, and e a small normal
// jitter (sd `jitter` times the complement's spread in each dimension) that keeps the chain
// irreducible. The proposal is symmetric, so the log correction is 0.
export function proposeDifferentialEvolution(
  positions: Float64Array, dim: number,
  first: number, count: number, other: number, otherCount: number,
  random: SeededStream, gamma: number, jitter: number,
  proposals: Float64Array, logCorrection: Float64Array, jitterScale: Float64Array,
): void {
  complementSpread(positions, dim, other, otherCount, jitterScale);
  for (let d = 0; d < dim; d++) jitterScale[d] *= jitter;
  for (let i = 0; i < count; i++) {
    const j = other + random.integer(otherCount);
    let k = other + random.integer(otherCount - 1);
    if (k >= j) k++;
    const self = (first + i) * dim;
    for (let d = 0; d < dim; d++) {
      proposals[i * dim + d] = positions[self + d]
        + gamma * (positions[j * dim + d] - positions[k * dim + d])
        + jitterScale[d] * random.normal();
    }
    logCorrection[i] = 0;
  }
}

/** Sample standard deviation of each dimension over walkers [other, other + otherCount). */
function complementSpread(
  positions: Float64Array, dim: number, other: number, otherCount: number, out: Float64Array,
): void {
  for (let d = 0; d < dim; d++) {
    let mean = 0;
    for (let w = other; w < other + otherCount; w++) mean += positions[w * dim + d];
    mean /= otherCount;
    let sumSquares = 0;
    for (let w = other; w < other + otherCount; w++) sumSquares += (positions[w * dim + d] - mean) ** 2;
    out[d] = Math.sqrt(sumSquares / (otherCount - 1));
  }
}

/** ter Braak's (2006) default jump scale for dimension d: 2.38 / sqrt(2 d). */
export function defaultDifferentialEvolutionGamma(dim: number): number {
  return 2.38 / Math.sqrt(2 * dim);
}
