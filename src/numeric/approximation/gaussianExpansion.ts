import { Matrix, SingularValueDecomposition } from 'ml-matrix';

/** A positive radial function written as a sum of Gaussians, f(r) ~ sum_j a_j exp(-r^2 / (2 s_j^2)). */
export interface GaussianExpansion {
  readonly widths: Float64Array;
  readonly amplitudes: Float64Array;
  /** The radii between which the fit was made (outside, the sum is not meant to follow f). */
  readonly minRadius: number;
  readonly maxRadius: number;
}

export interface GaussianExpansionOptions {
  readonly minRadius: number;
  readonly maxRadius: number;
  /** Gaussians per decade of width (the widths are spaced evenly in log r). */
  readonly widthsPerDecade: number;
  /** The narrowest width is this times minRadius, the widest this times maxRadius. */
  readonly innerWidthFactor?: number;
  readonly outerWidthFactor?: number;
  /** Residuals are weighted by 1 / (f(r) + floor): relative where f is above the floor. */
  readonly floor?: number;
  /** Sample radii per decade. */
  readonly samplesPerDecade?: number;
}

/** Singular values below this fraction of the largest are dropped (the widths overlap strongly). */
const SINGULAR_CUTOFF = 1e-13;

/**
 * Multi-Gaussian expansion of a radial profile in the manner of Cappellari 2002 (MNRAS 333, 400,
 * sec. 3: fixed widths evenly spaced in log r, amplitudes by linear least squares on a logarithmic
 * grid of radii, residuals relative to the profile), without his positivity constraint: a profile
 * narrower in log r than the width spacing needs neighbouring Gaussians of opposite sign. The least
 * squares are solved by the singular value decomposition (Golub & Van Loan 2013, sec. 5.5) with
 * singular values below SINGULAR_CUTOFF of the largest set aside. Run once per profile shape, not per
 * pixel: it allocates.
 */
export function fitGaussianExpansion(profile: (r: number) => number, options: GaussianExpansionOptions): GaussianExpansion {
  const { minRadius, maxRadius, widthsPerDecade } = options;
  const innerWidth = minRadius * (options.innerWidthFactor ?? 0.3);
  const outerWidth = maxRadius * (options.outerWidthFactor ?? 2);
  const floor = options.floor ?? 0;
  const widthCount = Math.ceil(Math.log10(outerWidth / innerWidth) * widthsPerDecade) + 1;
  const sampleCount = Math.ceil(Math.log10(maxRadius / minRadius) * (options.samplesPerDecade ?? 60)) + 1;
  const widths = new Float64Array(widthCount);
  for (let j = 0; j < widthCount; j++) widths[j] = innerWidth * Math.pow(outerWidth / innerWidth, j / (widthCount - 1));
  const design = new Matrix(sampleCount, widthCount);
  const target = new Float64Array(sampleCount);
  for (let i = 0; i < sampleCount; i++) {
    const r = minRadius * Math.pow(maxRadius / minRadius, i / (sampleCount - 1));
    const value = profile(r);
    const weight = 1 / (value + floor);
    target[i] = value * weight;
    for (let j = 0; j < widthCount; j++) design.set(i, j, weight * Math.exp((-0.5 * r * r) / (widths[j] * widths[j])));
  }
  return { widths, amplitudes: leastSquares(design, target), minRadius, maxRadius };
}

// Minimum-norm least-squares solution V diag(1/s) U^T b over the kept singular values.
function leastSquares(design: Matrix, target: Float64Array): Float64Array {
  const svd = new SingularValueDecomposition(design, { autoTranspose: true });
  const u = svd.leftSingularVectors, v = svd.rightSingularVectors, s = svd.diagonal;
  const columns = design.columns, cutoff = SINGULAR_CUTOFF * s[0];
  const solution = new Float64Array(columns);
  for (let k = 0; k < s.length; k++) {
    if (s[k] <= cutoff) continue;
    let projection = 0;
    for (let i = 0; i < target.length; i++) projection += u.get(i, k) * target[i];
    const scale = projection / s[k];
    for (let j = 0; j < columns; j++) solution[j] += scale * v.get(j, k);
  }
  return solution;
}
