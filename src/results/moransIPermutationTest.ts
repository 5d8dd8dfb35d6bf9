import { SeededStream } from '../numeric/random/seededStream.js';
import type { GridNeighbours } from './gridNeighbours.js';
import { centred, neighbourCrossProduct } from './moransI.js';

/** The permutation test's outcome, with the permutation distribution's first two moments. */
export interface MoransIPermutation {
  /** One-sided (positive autocorrelation) p-value (1 + #{I_perm >= I}) / (1 + permutations). */
  readonly pValue: number;
  readonly permutations: number;
  readonly permutationMean: number;
  readonly permutationVariance: number;
}

/**
 * Permutation test of Moran's I against no spatial autocorrelation (the randomisation null of
 * Cliff & Ord 1981, sec. 1.5): the values are shuffled over the pixels `permutations` times by the
 * Fisher-Yates shuffle (Durstenfeld 1964) from a SeededStream, and the p-value counts the
 * shuffles whose I reaches the observed one, the observation included (Davison & Hinkley 1997,
 * eq. 4.11), so it is valid (never below its nominal level) for any number of shuffles. Shuffling
 * keeps the mean and sum of squares, so only the cross-product is recomputed. The same seed gives
 * the same p-value.
 */
export function moransIPermutationTest(
  values: ArrayLike<number>, neighbours: GridNeighbours, permutations: number, seed: number,
): MoransIPermutation {
  const z = centred(values), n = neighbours.count;
  const observed = neighbourCrossProduct(z, neighbours);
  let sum2 = 0;
  for (let k = 0; k < n; k++) sum2 += z[k] * z[k];
  const scale = n / (neighbours.weightSum * sum2);
  const stream = SeededStream.fromSeed(seed);
  let reached = 0, mean = 0, square = 0;
  for (let s = 0; s < permutations; s++) {
    for (let k = n - 1; k > 0; k--) {
      const j = stream.integer(k + 1), swap = z[k];
      z[k] = z[j];
      z[j] = swap;
    }
    const cross = neighbourCrossProduct(z, neighbours);
    if (cross >= observed) reached++;
    const statistic = scale * cross;
    mean += statistic;
    square += statistic * statistic;
  }
  mean /= permutations;
  return {
    pValue: (1 + reached) / (1 + permutations),
    permutations,
    permutationMean: mean,
    permutationVariance: (square - permutations * mean * mean) / (permutations - 1),
  };
}
