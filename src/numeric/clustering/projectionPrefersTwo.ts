import { kishEffectiveSampleSize } from '../statistics/kishEffectiveSampleSize.js';

/**
 * Whether a cluster divided into two halves (per-row weights `halves[0]`, `halves[1]`, zero off the
 * cluster) is better described by two Gaussians than by one along the line through the halves'
 * means: the rows are projected on that line, a one- and a two-component Gaussian mixture (EM from
 * the halves) are fitted to the projections, and two win when their Bayesian information criterion
 * (Schwarz 1978; 2 against 5 parameters, n the Kish effective sample size) is lower by more than
 * 10, "very strong" evidence on the scale of Kass & Raftery 1995 (JASA 90, 773, Section 3.2):
 * k-means picks the line that separates best, so a single Gaussian cloud of a few dozen points
 * often beats a bare BIC comparison along it. The test of
 * a split in one dimension, after G-means (Hamerly & Elkan 2003, NIPS 16), which tests the same
 * projection for normality: it finds separated clusters that a BIC over full covariances in d
 * dimensions, with d (d + 3) / 2 parameters per component, would not split from few points.
 */
/** BIC difference of "very strong" evidence (Kass & Raftery 1995, Section 3.2). */
const veryStrong = 10;

export function projectionPrefersTwo(rows: Float64Array, halves: readonly Float64Array[], count: number, dim: number): boolean {
  return projectionSplitGain(rows, halves, count, dim) > veryStrong;
}

/** BIC(one Gaussian) - BIC(two Gaussians) of the projections (see projectionPrefersTwo); -Infinity when too few points. */
export function projectionSplitGain(rows: Float64Array, halves: readonly Float64Array[], count: number, dim: number): number {
  const means = halves.map((w) => weightedMean(rows, w, count, dim));
  const direction = new Float64Array(dim);
  for (let a = 0; a < dim; a++) direction[a] = means[1][a] - means[0][a];
  const weights = new Float64Array(count);
  const projection = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    weights[i] = halves[0][i] + halves[1][i];
    let t = 0;
    for (let a = 0; a < dim; a++) t += direction[a] * rows[i * dim + a];
    projection[i] = t;
  }
  const n = kishEffectiveSampleSize(weights);
  if (!(n > 5)) return -Infinity;
  const one = oneGaussian(projection, weights);
  const two = twoGaussians(projection, halves, one.variance);
  return -2 * n * one.meanLnDensity + 2 * Math.log(n) - (-2 * n * two + 5 * Math.log(n));
}

function weightedMean(rows: Float64Array, w: Float64Array, count: number, dim: number): Float64Array {
  const mean = new Float64Array(dim);
  let mass = 0;
  for (let i = 0; i < count; i++) mass += w[i];
  for (let i = 0; i < count; i++) {
    if (w[i] === 0) continue;
    for (let a = 0; a < dim; a++) mean[a] += (w[i] / mass) * rows[i * dim + a];
  }
  return mean;
}

function moments(t: Float64Array, w: Float64Array): { share: number; mean: number; variance: number } {
  let mass = 0;
  let mean = 0;
  for (let i = 0; i < t.length; i++) {
    mass += w[i];
    mean += w[i] * t[i];
  }
  mean /= mass;
  let variance = 0;
  for (let i = 0; i < t.length; i++) variance += w[i] * (t[i] - mean) ** 2;
  return { share: mass, mean, variance: variance / mass };
}

function lnNormal(t: number, mean: number, variance: number): number {
  return -0.5 * Math.log(2 * Math.PI * variance) - (0.5 * (t - mean) ** 2) / variance;
}

/** Weighted mean ln density of the projections under one Gaussian (its maximum-likelihood fit). */
function oneGaussian(t: Float64Array, w: Float64Array): { meanLnDensity: number; variance: number } {
  const { share, mean, variance } = moments(t, w);
  let sum = 0;
  for (let i = 0; i < t.length; i++) if (w[i] > 0) sum += w[i] * lnNormal(t[i], mean, variance);
  return { meanLnDensity: sum / share, variance };
}

/** Weighted mean ln density under two Gaussians fitted by 100 EM iterations from the halves; variances floored at 1e-6 of the whole. */
function twoGaussians(t: Float64Array, halves: readonly Float64Array[], wholeVariance: number): number {
  const floor = 1e-6 * wholeVariance;
  const parts = halves.map((w) => moments(t, w));
  const total = parts[0].share + parts[1].share;
  const responsibility = [new Float64Array(t.length), new Float64Array(t.length)];
  let meanLnDensity = -Infinity;
  for (let iteration = 0; iteration < 100; iteration++) {
    let sum = 0;
    for (let i = 0; i < t.length; i++) {
      const w = halves[0][i] + halves[1][i];
      if (w === 0) continue;
      const a = Math.log(parts[0].share / total) + lnNormal(t[i], parts[0].mean, Math.max(floor, parts[0].variance));
      const b = Math.log(parts[1].share / total) + lnNormal(t[i], parts[1].mean, Math.max(floor, parts[1].variance));
      const top = Math.max(a, b);
      const lnSum = top + Math.log(Math.exp(a - top) + Math.exp(b - top));
      responsibility[0][i] = w * Math.exp(a - lnSum);
      responsibility[1][i] = w * Math.exp(b - lnSum);
      sum += w * lnSum;
    }
    const next = sum / total;
    const done = Math.abs(next - meanLnDensity) < 1e-9;
    meanLnDensity = next;
    if (done) break;
    for (let c = 0; c < 2; c++) parts[c] = moments(t, responsibility[c]);
    if (!(parts[0].share > 0 && parts[1].share > 0)) break;
  }
  return meanLnDensity;
}
