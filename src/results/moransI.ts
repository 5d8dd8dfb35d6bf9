import type { GridNeighbours } from './gridNeighbours.js';

/** Moran's I of some values on a neighbour graph, with its moments under the null of no autocorrelation. */
export interface MoransI {
  readonly statistic: number;
  /** E[I] = -1 / (n - 1), under either null. */
  readonly expectation: number;
  /** Var[I] under normality (values independent normal) and under randomisation (values a random permutation). */
  readonly varianceNormality: number;
  readonly varianceRandomisation: number;
  /** (I - E[I]) / sqrt(Var_randomisation[I]). */
  readonly zScore: number;
}

// Sum_i z_i sum_(j in N(i)) z_j: the cross-product of Moran's I with binary weights (one pass, no allocation).
export function neighbourCrossProduct(z: Float64Array, neighbours: GridNeighbours): number {
  const { start, list } = neighbours;
  let sum = 0;
  for (let k = 0; k < neighbours.count; k++) {
    let around = 0;
    for (let m = start[k]; m < start[k + 1]; m++) around += z[list[m]];
    sum += z[k] * around;
  }
  return sum;
}

/** The values less their mean, in a new array (values[k] belongs to used pixel k). */
export function centred(values: ArrayLike<number>): Float64Array {
  let mean = 0;
  for (let k = 0; k < values.length; k++) mean += values[k];
  mean /= values.length;
  return Float64Array.from(values, (v) => v - mean);
}

// Moran 1950 (Biometrika 37, 17): I = (n / S0) sum_ij w_ij z_i z_j / sum_i z_i^2, z the centred values.
// Its moments under normality and randomisation: Cliff & Ord 1981 (Spatial Processes, eqs. 1.35-1.38;
// equation numbers from memory), with S0 = sum_ij w_ij, S1 = (1/2) sum_ij (w_ij + w_ji)^2 = 2 S0 and
// S2 = sum_i (w_i. + w_.i)^2 = 4 sum_i d_i^2 for binary symmetric weights (d_i the neighbour count),
// and b2 = n sum z^4 / (sum z^2)^2:
//   Var_N = (n^2 S1 - n S2 + 3 S0^2) / ((n^2 - 1) S0^2) - E^2,
//   Var_R = [n ((n^2 - 3n + 3) S1 - n S2 + 3 S0^2) - b2 ((n^2 - n) S1 - 2n S2 + 6 S0^2)]
//           / ((n - 1)(n - 2)(n - 3) S0^2) - E^2.
export function moransI(values: ArrayLike<number>, neighbours: GridNeighbours): MoransI {
  const n = neighbours.count, z = centred(values);
  let sum2 = 0, sum4 = 0, degreeSquares = 0;
  for (let k = 0; k < n; k++) {
    const z2 = z[k] * z[k];
    sum2 += z2;
    sum4 += z2 * z2;
    const degree = neighbours.start[k + 1] - neighbours.start[k];
    degreeSquares += degree * degree;
  }
  const s0 = neighbours.weightSum, s1 = 2 * s0, s2 = 4 * degreeSquares;
  const statistic = ((n / s0) * neighbourCrossProduct(z, neighbours)) / sum2;
  const expectation = -1 / (n - 1);
  const varianceNormality = (n * n * s1 - n * s2 + 3 * s0 * s0) / ((n * n - 1) * s0 * s0) - expectation * expectation;
  const b2 = (n * sum4) / (sum2 * sum2);
  const varianceRandomisation =
    (n * ((n * n - 3 * n + 3) * s1 - n * s2 + 3 * s0 * s0) - b2 * ((n * n - n) * s1 - 2 * n * s2 + 6 * s0 * s0)) /
      ((n - 1) * (n - 2) * (n - 3) * s0 * s0) - expectation * expectation;
  return {
    statistic, expectation, varianceNormality, varianceRandomisation,
    zScore: (statistic - expectation) / Math.sqrt(varianceRandomisation),
  };
}
