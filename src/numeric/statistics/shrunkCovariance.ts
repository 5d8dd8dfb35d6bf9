/**
 * Weighted covariance of `count` rows (width dim) about `mean`, its correlations shrunk toward zero
 * (Schafer & Strimmer 2005, Statistical Applications in Genetics and Molecular Biology 4, 32,
 * target D "diagonal, unequal variance", Section 3.3 and Table 1): the variances are kept and each
 * correlation r_ab becomes (1 - lambda) r_ab with lambda = sum_{a != b} Var(r_ab) / sum_{a != b} r_ab^2
 * clipped to [0, 1], Var(r_ab) estimated as sum_i u_i^2 (z_ia z_ib - r_ab)^2 with u the normalised
 * weights and z the standardised rows (their eq. 11 with weights). With many points lambda is near
 * 0; with fewer points than dimensions it keeps the matrix positive definite. Returns the full
 * d x d matrix, row-major.
 */
export function shrunkCovariance(
  rows: Float64Array, weights: Float64Array, count: number, dim: number, mean: Float64Array, mass: number,
): Float64Array {
  const sd = new Float64Array(dim);
  for (let i = 0; i < count; i++) {
    if (weights[i] === 0) continue;
    for (let a = 0; a < dim; a++) {
      const d = rows[i * dim + a] - mean[a];
      sd[a] += (weights[i] / mass) * d * d;
    }
  }
  for (let a = 0; a < dim; a++) sd[a] = Math.sqrt(sd[a]);
  const z = standardised(rows, count, dim, mean, sd);
  const correlation = weightedCorrelation(z, weights, count, dim, mass);
  const spread = correlationSpread(z, weights, count, dim, mass, correlation);
  let numerator = 0;
  let denominator = 0;
  for (let a = 0; a < dim; a++) {
    for (let b = 0; b < a; b++) {
      numerator += spread[a * dim + b];
      denominator += correlation[a * dim + b] ** 2;
    }
  }
  const lambda = denominator > 0 ? Math.min(1, Math.max(0, numerator / denominator)) : 1;
  const covariance = new Float64Array(dim * dim);
  for (let a = 0; a < dim; a++) {
    covariance[a * dim + a] = sd[a] * sd[a];
    for (let b = 0; b < a; b++) {
      const value = (1 - lambda) * correlation[a * dim + b] * sd[a] * sd[b];
      covariance[a * dim + b] = value;
      covariance[b * dim + a] = value;
    }
  }
  return covariance;
}

/** Standardised rows z_ia = (x_ia - mean_a) / sd_a (0 where sd_a = 0). */
function standardised(rows: Float64Array, count: number, dim: number, mean: Float64Array, sd: Float64Array): Float64Array {
  const z = new Float64Array(count * dim);
  for (let i = 0; i < count; i++) {
    for (let a = 0; a < dim; a++) z[i * dim + a] = sd[a] > 0 ? (rows[i * dim + a] - mean[a]) / sd[a] : 0;
  }
  return z;
}

/** Lower triangle of the weighted correlations sum_i u_i z_ia z_ib. */
function weightedCorrelation(z: Float64Array, weights: Float64Array, count: number, dim: number, mass: number): Float64Array {
  const correlation = new Float64Array(dim * dim);
  for (let i = 0; i < count; i++) {
    if (weights[i] === 0) continue;
    const u = weights[i] / mass;
    for (let a = 0; a < dim; a++) {
      for (let b = 0; b < a; b++) correlation[a * dim + b] += u * z[i * dim + a] * z[i * dim + b];
    }
  }
  return correlation;
}

/** Lower triangle of the estimated variances sum_i u_i^2 (z_ia z_ib - r_ab)^2 of the correlations. */
function correlationSpread(z: Float64Array, weights: Float64Array, count: number, dim: number, mass: number, correlation: Float64Array): Float64Array {
  const spread = new Float64Array(dim * dim);
  for (let i = 0; i < count; i++) {
    if (weights[i] === 0) continue;
    const u = weights[i] / mass;
    for (let a = 0; a < dim; a++) {
      for (let b = 0; b < a; b++) spread[a * dim + b] += u * u * (z[i * dim + a] * z[i * dim + b] - correlation[a * dim + b]) ** 2;
    }
  }
  return spread;
}
