import { gammaln } from '../../numeric/special/stdlibSpecial.js';
import { logSumExp } from '../../numeric/statistics/logSumExp.js';
import type { SeededStream } from '../../numeric/random/seededStream.js';

/** One multivariate Student-t component: mean and lower Cholesky factor of its scale matrix. */
export interface StudentComponent {
  /** ln of the component's share of the non-defensive part (the shares sum to 1). */
  readonly lnShare: number;
  readonly mean: Float64Array;
  /** lower-triangular L (d x d, row-major) with scale matrix L L^T. */
  readonly cholesky: Float64Array;
  /** sum of ln L_ii, i.e. ln sqrt(det(L L^T)). */
  readonly lnRootDet: number;
}

/**
 * A proposal density on R^d: with probability 1 - defensive a mixture of Student-t components
 * of `dof` degrees of freedom, with probability `defensive` the uniform density on the unit cube
 * [0, 1)^d (defensive importance sampling, Hesterberg 1995, Technometrics 37, 185: it bounds
 * every weight by L / defensive).
 */
export interface StudentMixture {
  readonly dim: number;
  readonly dof: number;
  readonly defensive: number;
  readonly components: readonly StudentComponent[];
}

/** Plain-JSON form of a mixture (checkpoints, run records). */
export interface StudentMixtureRecord {
  readonly dim: number;
  readonly dof: number;
  readonly defensive: number;
  readonly components: readonly { readonly lnShare: number; readonly mean: number[]; readonly cholesky: number[] }[];
}

/** A component from its share, mean and lower Cholesky factor (strict upper triangle ignored). */
export function studentComponent(lnShare: number, mean: Float64Array, cholesky: Float64Array, dim: number): StudentComponent {
  let lnRootDet = 0;
  for (let i = 0; i < dim; i++) lnRootDet += Math.log(cholesky[i * dim + i]);
  return { lnShare, mean, cholesky, lnRootDet };
}

export function recordStudentMixture(mixture: StudentMixture): StudentMixtureRecord {
  return {
    dim: mixture.dim,
    dof: mixture.dof,
    defensive: mixture.defensive,
    components: mixture.components.map((c) => ({ lnShare: c.lnShare, mean: Array.from(c.mean), cholesky: Array.from(c.cholesky) })),
  };
}

export function restoreStudentMixture(record: StudentMixtureRecord): StudentMixture {
  return {
    dim: record.dim,
    dof: record.dof,
    defensive: record.defensive,
    components: record.components.map((c) =>
      studentComponent(c.lnShare, Float64Array.from(c.mean), Float64Array.from(c.cholesky), record.dim)),
  };
}

/**
 * Evaluates ln q(x) of a StudentMixture at rows of x; the scratch buffers are allocated once per
 * mixture, so a call allocates nothing.
 */
export class StudentMixtureDensity {
  readonly mixture: StudentMixture;
  private readonly lnNormalisation: number;
  private readonly lnTerms: Float64Array;
  private readonly whitened: Float64Array;

  constructor(mixture: StudentMixture) {
    const { dim, dof } = mixture;
    this.mixture = mixture;
    // Student-t density normalisation (e.g. Kotz & Nadarajah 2004, Multivariate t Distributions, eq. 1.1).
    this.lnNormalisation = gammaln(0.5 * (dof + dim)) - gammaln(0.5 * dof) - 0.5 * dim * Math.log(dof * Math.PI);
    this.lnTerms = new Float64Array(mixture.components.length + 1);
    this.whitened = new Float64Array(dim);
  }

  /**
   * ln q of the row starting at points[offset]: ln[(1 - a) sum_k pi_k t_nu(x; mu_k, S_k) + a 1_cube(x)],
   * with ln t_nu = ln Gamma((nu + d)/2) - ln Gamma(nu/2) - (d/2) ln(nu pi) - ln|L| - ((nu + d)/2) ln(1 + m/nu),
   * m the squared Mahalanobis distance (Kotz & Nadarajah 2004, eq. 1.1).
   */
  lnDensity(points: ArrayLike<number>, offset: number): number {
    const { dim, dof, defensive, components } = this.mixture;
    const lnMixed = Math.log1p(-defensive);
    for (let k = 0; k < components.length; k++) {
      const m = this.mahalanobisSquared(components[k], points, offset);
      this.lnTerms[k] = lnMixed + components[k].lnShare + this.lnNormalisation - components[k].lnRootDet - 0.5 * (dof + dim) * Math.log1p(m / dof);
    }
    let inside = defensive > 0;
    for (let i = 0; i < dim && inside; i++) inside = points[offset + i] >= 0 && points[offset + i] < 1;
    this.lnTerms[components.length] = inside ? Math.log(defensive) : -Infinity;
    return logSumExp(this.lnTerms, components.length + 1);
  }

  /** (x - mu)^T S^-1 (x - mu) by forward substitution with L (Golub & Van Loan 2013, Algorithm 3.1.1). */
  private mahalanobisSquared(component: StudentComponent, points: ArrayLike<number>, offset: number): number {
    const { dim } = this.mixture;
    const { mean, cholesky } = component;
    const y = this.whitened;
    let sum = 0;
    for (let i = 0; i < dim; i++) {
      let s = points[offset + i] - mean[i];
      for (let j = 0; j < i; j++) s -= cholesky[i * dim + j] * y[j];
      y[i] = s / cholesky[i * dim + i];
      sum += y[i] * y[i];
    }
    return sum;
  }
}

/**
 * One draw from a StudentMixture into out[0..dim): the component by its share, then
 * x = mu + L z sqrt(nu / g), z standard normal, g chi-square with nu (integer) degrees of freedom as
 * a sum of nu squared normals (the normal-gamma scale mixture that defines the multivariate t,
 * Kotz & Nadarajah 2004, eq. 1.2). `scratch` holds dim values.
 */
export function drawFromStudentMixture(mixture: StudentMixture, stream: SeededStream, out: Float64Array, scratch: Float64Array): void {
  const { dim, dof, defensive, components } = mixture;
  if (stream.uniform() < defensive) {
    for (let i = 0; i < dim; i++) out[i] = stream.uniform();
    return;
  }
  let pick = stream.uniform();
  let chosen = components.length - 1;
  for (let k = 0; k < components.length; k++) {
    pick -= Math.exp(components[k].lnShare);
    if (pick < 0) {
      chosen = k;
      break;
    }
  }
  const { mean, cholesky } = components[chosen];
  for (let i = 0; i < dim; i++) scratch[i] = stream.normal();
  let chiSquare = 0;
  for (let j = 0; j < dof; j++) {
    const z = stream.normal();
    chiSquare += z * z;
  }
  const scale = Math.sqrt(dof / chiSquare);
  for (let i = 0; i < dim; i++) {
    let s = 0;
    for (let j = 0; j <= i; j++) s += cholesky[i * dim + j] * scratch[j];
    out[i] = mean[i] + scale * s;
  }
}
