import { choleskyWithRidge } from '../../numeric/linearAlgebra/choleskyWithRidge.js';
import { kishEffectiveSampleSize } from '../../numeric/statistics/kishEffectiveSampleSize.js';
import { shrunkCovariance } from '../../numeric/statistics/shrunkCovariance.js';
import { kMeansTwo } from '../../numeric/clustering/kMeansTwo.js';
import { projectionSplitGain } from '../../numeric/clustering/projectionPrefersTwo.js';

/** BIC gain of a projected split taken as very strong (as in projectionPrefersTwo). */
const veryStrongGain = 10;

/** A Gaussian mixture fitted to weighted points. */
export interface GaussianMixtureFit {
  readonly dim: number;
  /** component shares, summing to 1. */
  readonly shares: Float64Array;
  readonly means: readonly Float64Array[];
  /** lower Cholesky factors of the covariances (d x d, row-major, strict upper triangle zero). */
  readonly choleskys: readonly Float64Array[];
  /** sum_i w_i ln p(x_i) with the weights normalised to 1. */
  readonly meanLnDensity: number;
  /** Bayesian information criterion with the Kish effective sample size as the number of points. */
  readonly bic: number;
}

export interface GaussianMixtureOptions {
  /** largest number of components. */
  readonly maxComponents: number;
  /** a component must carry at least this many effective points (Kish); default 5. */
  readonly minEffectivePoints?: number;
  /** EM iterations per candidate; default 30. */
  readonly maxIterations?: number;
}

/**
 * A Gaussian mixture fitted to `count` weighted rows (width dim) by expectation-maximisation
 * (Dempster, Laird & Rubin 1977; weighted form: each row's responsibilities scaled by its weight),
 * grown from one component by splitting (bestSplit): a component's rows (those it is most
 * responsible for) are divided by two-cluster k-means, EM refines the whole mixture, and the split
 * is kept when the rows projected on the line between the halves are very strongly bimodal
 * (projectionSplitGain), or when it lowers the Bayesian information criterion
 * BIC = -2 n ln L + p ln n (Schwarz 1978), n the Kish effective sample size and
 * p = K (d + d(d+1)/2) + K - 1 (the "x-means" way of choosing K, Pelleg & Moore 2000). Covariances
 * are shrunk (shrunkCovariance) so that a component of few points stays well conditioned.
 * Deterministic: no random draws.
 */
export function fitGaussianMixture(
  rows: Float64Array, weights: Float64Array, count: number, dim: number, options: GaussianMixtureOptions,
): GaussianMixtureFit {
  const normalised = new Float64Array(count);
  let total = 0;
  for (let i = 0; i < count; i++) total += weights[i];
  for (let i = 0; i < count; i++) normalised[i] = weights[i] / total;
  const fitter = new MixtureEm(rows, normalised, count, dim, options.maxIterations ?? 30);
  const minEffective = options.minEffectivePoints ?? 5;
  let current = fitter.run([{ share: 1, weights: normalised }]);
  for (;;) {
    if (current.shares.length >= options.maxComponents) break;
    const split = bestSplit(fitter, current, minEffective);
    if (split === null) break;
    current = split;
  }
  return current;
}

/** Starting responsibilities of one component: its share and the per-row weights it starts from. */
interface Seed {
  readonly share: number;
  readonly weights: Float64Array;
}

/**
 * The split that lowers the BIC or separates along its projection, or null: the component whose
 * projected halves are most bimodal (largest projectionSplitGain) is split when that gain is very
 * strong; otherwise the largest component is tried against the full BIC. At most two EM runs per
 * call, which keeps the fit fast with many rows.
 */
function bestSplit(fitter: MixtureEm, current: GaussianMixtureFit, minEffective: number): GaussianMixtureFit | null {
  const responsibilities = fitter.responsibilities(current);
  const K = current.shares.length;
  let bimodal = -1;
  let bestGain = -Infinity;
  const halvesOf: (Float64Array[] | null)[] = [];
  for (let k = 0; k < K; k++) {
    const halves = fitter.effectivePoints(responsibilities[k]) < 2 * minEffective ? null : fitter.splitRows(responsibilities, k);
    halvesOf.push(halves);
    if (halves === null) continue;
    const gain = fitter.splitGain(halves);
    if (gain > bestGain) {
      bestGain = gain;
      bimodal = k;
    }
  }
  let largest = -1;
  for (let k = 0; k < K; k++) if (halvesOf[k] !== null && (largest < 0 || current.shares[k] > current.shares[largest])) largest = k;
  const tries: { k: number; projected: boolean }[] = [];
  if (bimodal >= 0 && bestGain > veryStrongGain) tries.push({ k: bimodal, projected: true });
  if (largest >= 0 && !(bimodal === largest && bestGain > veryStrongGain)) tries.push({ k: largest, projected: false });
  for (const { k, projected } of tries) {
    const seeds: Seed[] = [];
    for (let j = 0; j < K; j++) if (j !== k) seeds.push({ share: current.shares[j], weights: responsibilities[j] });
    for (const half of halvesOf[k]!) seeds.push({ share: current.shares[k] / 2, weights: half });
    const candidate = fitter.run(seeds);
    if (candidate.shares.length !== K + 1) continue;
    if (fitter.responsibilities(candidate).some((r) => fitter.effectivePoints(r) < minEffective)) continue;
    if (projected || candidate.bic < current.bic) return candidate;
  }
  return null;
}

/** Weighted EM over fixed rows; the per-row scratch is allocated once. */
class MixtureEm {
  private readonly rows: Float64Array;
  private readonly weights: Float64Array;
  private readonly count: number;
  private readonly dim: number;
  private readonly maxIterations: number;
  private readonly effectiveCount: number;
  private readonly whitened: Float64Array;

  constructor(rows: Float64Array, weights: Float64Array, count: number, dim: number, maxIterations: number) {
    this.rows = rows;
    this.weights = weights;
    this.count = count;
    this.dim = dim;
    this.maxIterations = maxIterations;
    this.effectiveCount = kishEffectiveSampleSize(weights.subarray(0, count));
    this.whitened = new Float64Array(dim);
  }

  /** projectionSplitGain on these rows. */
  splitGain(halves: readonly Float64Array[]): number {
    return projectionSplitGain(this.rows, halves, this.count, this.dim);
  }

  /** Kish effective number of rows behind per-row weights w_i r_ik. */
  effectivePoints(rowWeights: Float64Array): number {
    return kishEffectiveSampleSize(rowWeights);
  }

  /** EM from the given starting components until the mean ln density changes by < 1e-5 (or maxIterations). */
  run(seeds: readonly Seed[]): GaussianMixtureFit {
    let fit = this.maximise(seeds.map((s) => s.weights));
    let state = this.expect(fit);
    for (let iteration = 0; iteration < this.maxIterations; iteration++) {
      const next = this.maximise(state.responsibilities);
      const nextState = this.expect(next);
      const done = Math.abs(nextState.meanLnDensity - state.meanLnDensity) < 1e-5;
      fit = next;
      state = nextState;
      if (done) break;
    }
    const K = fit.shares.length;
    const parameters = K * (this.dim + (this.dim * (this.dim + 1)) / 2) + K - 1;
    const n = this.effectiveCount;
    return { ...fit, meanLnDensity: state.meanLnDensity, bic: -2 * n * state.meanLnDensity + parameters * Math.log(n) };
  }

  /** Per component, the row weights w_i r_ik (r_ik the responsibility of component k for row i). */
  responsibilities(fit: GaussianMixtureFit): Float64Array[] {
    return this.expect(fit).responsibilities;
  }

  /**
   * E-step (Dempster, Laird & Rubin 1977): w_i r_ik for every component, and the weighted mean ln
   * density sum_i w_i ln p(x_i), in one pass.
   */
  private expect(fit: GaussianMixtureFit): { responsibilities: Float64Array[]; meanLnDensity: number } {
    const K = fit.shares.length;
    const { dim } = this;
    const result = Array.from({ length: K }, () => new Float64Array(this.count));
    const lnConstant = new Float64Array(K);
    for (let k = 0; k < K; k++) {
      let lnRootDet = 0;
      for (let a = 0; a < dim; a++) lnRootDet += Math.log(fit.choleskys[k][a * dim + a]);
      lnConstant[k] = Math.log(fit.shares[k]) - 0.5 * dim * Math.log(2 * Math.PI) - lnRootDet;
    }
    const lnTerms = new Float64Array(K);
    let meanLnDensity = 0;
    for (let i = 0; i < this.count; i++) {
      if (this.weights[i] === 0) continue;
      let largest = -Infinity;
      for (let k = 0; k < K; k++) {
        lnTerms[k] = lnConstant[k] - 0.5 * this.mahalanobisSquared(fit.means[k], fit.choleskys[k], i);
        if (lnTerms[k] > largest) largest = lnTerms[k];
      }
      let sum = 0;
      for (let k = 0; k < K; k++) sum += Math.exp(lnTerms[k] - largest);
      for (let k = 0; k < K; k++) result[k][i] = (this.weights[i] * Math.exp(lnTerms[k] - largest)) / sum;
      meanLnDensity += this.weights[i] * (largest + Math.log(sum));
    }
    return { responsibilities: result, meanLnDensity };
  }

  /** The rows component k is most responsible for (given w_i r_ik), split in two by k-means; null if either half is empty. */
  splitRows(responsibilities: readonly Float64Array[], k: number): Float64Array[] | null {
    const members: number[] = [];
    for (let i = 0; i < this.count; i++) {
      if (this.weights[i] <= 0) continue;
      let best = 0;
      for (let j = 1; j < responsibilities.length; j++) if (responsibilities[j][i] > responsibilities[best][i]) best = j;
      if (best === k) members.push(i);
    }
    if (members.length < 2) return null;
    const labels = new Uint8Array(members.length);
    const sizeZero = kMeansTwo(this.rows, this.dim, members, members.length, labels);
    if (sizeZero === 0 || sizeZero === members.length) return null;
    const halves = [new Float64Array(this.count), new Float64Array(this.count)];
    members.forEach((row, n) => { halves[labels[n]][row] = responsibilities[k][row]; });
    return halves;
  }

  /** M-step: shares, weighted means and covariances (shrunkCovariance) from per-component row weights; empty components dropped. */
  private maximise(componentWeights: readonly Float64Array[]): GaussianMixtureFit {
    const { dim, count, rows } = this;
    const shares: number[] = [];
    const means: Float64Array[] = [];
    const choleskys: Float64Array[] = [];
    const scratch = new Float64Array(dim * dim);
    for (const w of componentWeights) {
      let mass = 0;
      for (let i = 0; i < count; i++) mass += w[i];
      if (!(mass > 0)) continue;
      const mean = new Float64Array(dim);
      for (let i = 0; i < count; i++) {
        if (w[i] === 0) continue;
        for (let a = 0; a < dim; a++) mean[a] += (w[i] * rows[i * dim + a]) / mass;
      }
      const covariance = shrunkCovariance(rows, w, count, dim, mean, mass);
      choleskyWithRidge(covariance, dim, scratch);
      shares.push(mass);
      means.push(mean);
      choleskys.push(covariance);
    }
    let total = 0;
    for (const share of shares) total += share;
    return { dim, shares: Float64Array.from(shares, (share) => share / total), means, choleskys, meanLnDensity: Number.NaN, bic: Number.NaN };
  }

  /** |L^-1 (x_i - mu)|^2 by forward substitution (Golub & Van Loan 2013, Algorithm 3.1.1). */
  private mahalanobisSquared(mean: Float64Array, cholesky: Float64Array, row: number): number {
    const { dim, rows } = this;
    const y = this.whitened;
    let squared = 0;
    for (let a = 0; a < dim; a++) {
      let s = rows[row * dim + a] - mean[a];
      for (let b = 0; b < a; b++) s -= cholesky[a * dim + b] * y[b];
      y[a] = s / cholesky[a * dim + a];
      squared += y[a] * y[a];
    }
    return squared;
  }
}

