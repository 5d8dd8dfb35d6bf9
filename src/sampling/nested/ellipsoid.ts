import { gammaln } from '../../numeric/special/stdlibSpecial.js';
import { forwardSubstitute } from '../../numeric/linearAlgebra/choleskyFactor.js';
import { choleskyWithRidge } from '../../numeric/linearAlgebra/choleskyWithRidge.js';
import type { SeededStream } from '../../numeric/random/seededStream.js';

/**
 * The region {x : (x - c)^T A^{-1} (x - c) <= 1} in the unit cube's coordinates. `shape` is A
 * (row-major, dim x dim), `factor` its lower Cholesky factor L (A = L L^T), and the volume is
 * V = V_ball(dim) * det(L).
 */
export interface Ellipsoid {
  readonly dim: number;
  readonly center: Float64Array;
  readonly shape: Float64Array;
  readonly factor: Float64Array;
  lnVolume: number;
}

/** ln of the volume of the unit ball in dim dimensions, pi^{d/2} / Gamma(d/2 + 1) (common practice). */
export function lnUnitBallVolume(dim: number): number {
  return 0.5 * dim * Math.log(Math.PI) - gammaln(0.5 * dim + 1);
}

/** An ellipsoid from its centre and shape matrix A (both copied). */
export function ellipsoidFromShape(center: ArrayLike<number>, shape: ArrayLike<number>, dim: number): Ellipsoid {
  const ellipsoid: Ellipsoid = {
    dim,
    center: Float64Array.from(center),
    shape: Float64Array.from(shape),
    factor: new Float64Array(dim * dim),
    lnVolume: 0,
  };
  refactor(ellipsoid);
  return ellipsoid;
}

function refactor(ellipsoid: Ellipsoid): void {
  const { dim, factor, shape } = ellipsoid;
  factor.set(shape);
  choleskyWithRidge(factor, dim, new Float64Array(dim * dim));
  let lnDeterminant = 0;
  for (let i = 0; i < dim; i++) lnDeterminant += Math.log(factor[i * dim + i]);
  ellipsoid.lnVolume = lnUnitBallVolume(dim) + lnDeterminant;
}

/** Multiplies the ellipsoid's volume by e^{lnFactor}, keeping its centre and orientation. */
export function scaleEllipsoidVolume(ellipsoid: Ellipsoid, lnFactor: number): void {
  const { dim } = ellipsoid;
  const shapeScale = Math.exp((2 * lnFactor) / dim);
  const factorScale = Math.exp(lnFactor / dim);
  for (let i = 0; i < dim * dim; i++) {
    ellipsoid.shape[i] *= shapeScale;
    ellipsoid.factor[i] *= factorScale;
  }
  ellipsoid.lnVolume += lnFactor;
}

/** (x - c)^T A^{-1} (x - c) by forward substitution with L; `scratch` has length >= dim. */
export function mahalanobisSquared(ellipsoid: Ellipsoid, x: ArrayLike<number>, offset: number, scratch: Float64Array): number {
  const { dim, center, factor } = ellipsoid;
  for (let i = 0; i < dim; i++) scratch[i] = x[offset + i] - center[i];
  forwardSubstitute(factor, dim, scratch, scratch);
  let sum = 0;
  for (let i = 0; i < dim; i++) sum += scratch[i] * scratch[i];
  return sum;
}

/**
 * Uniform draw inside the ellipsoid: a uniform point of the unit ball (direction of a standard
 * normal vector, radius U^{1/d}; Marsaglia 1972 / Muller 1959) mapped by x = c + L z. `scratch`
 * has length >= dim.
 */
export function sampleInEllipsoid(ellipsoid: Ellipsoid, stream: SeededStream, out: Float64Array, scratch: Float64Array): void {
  const { dim, center, factor } = ellipsoid;
  let norm = 0;
  for (let i = 0; i < dim; i++) {
    const value = stream.normal();
    scratch[i] = value;
    norm += value * value;
  }
  const radius = Math.pow(stream.uniform(), 1 / dim) / Math.sqrt(norm);
  for (let i = 0; i < dim; i++) scratch[i] *= radius;
  for (let i = 0; i < dim; i++) {
    let sum = center[i];
    for (let k = 0; k <= i; k++) sum += factor[i * dim + k] * scratch[k];
    out[i] = sum;
  }
}

/**
 * The smallest ellipsoid of the sample covariance's shape, centred on the sample mean, that contains
 * all given points (Feroz & Hobson 2008, Section 5.1.1; Mukherjee, Parkinson & Liddle 2006). Points
 * are rows of `points` (width dim) listed by `indices[0..count)`.
 */
export function enclosingEllipsoid(points: Float64Array, dim: number, indices: ArrayLike<number>, count: number): Ellipsoid {
  const center = new Float64Array(dim);
  for (let n = 0; n < count; n++) {
    const row = indices[n] * dim;
    for (let i = 0; i < dim; i++) center[i] += points[row + i];
  }
  for (let i = 0; i < dim; i++) center[i] /= count;
  const covariance = new Float64Array(dim * dim);
  const displacement = new Float64Array(dim);
  for (let n = 0; n < count; n++) {
    const row = indices[n] * dim;
    for (let i = 0; i < dim; i++) displacement[i] = points[row + i] - center[i];
    for (let i = 0; i < dim; i++) {
      for (let j = 0; j <= i; j++) covariance[i * dim + j] += displacement[i] * displacement[j];
    }
  }
  for (let i = 0; i < dim; i++) {
    for (let j = 0; j <= i; j++) {
      covariance[i * dim + j] /= count;
      covariance[j * dim + i] = covariance[i * dim + j];
    }
  }
  const ellipsoid = ellipsoidFromShape(center, covariance, dim);
  // Rebuild the shape from the (possibly ridge-loaded) factor so that A = L L^T exactly.
  const { factor, shape } = ellipsoid;
  for (let i = 0; i < dim; i++) {
    for (let j = 0; j < dim; j++) {
      let sum = 0;
      for (let k = 0; k <= Math.min(i, j); k++) sum += factor[i * dim + k] * factor[j * dim + k];
      shape[i * dim + j] = sum;
    }
  }
  let largest = 0;
  for (let n = 0; n < count; n++) {
    const distance = mahalanobisSquared(ellipsoid, points, indices[n] * dim, displacement);
    if (distance > largest) largest = distance;
  }
  if (!(largest > 0)) largest = 1;
  scaleEllipsoidVolume(ellipsoid, 0.5 * dim * Math.log(largest));
  return ellipsoid;
}

/**
 * Bootstrap estimate of how far an enclosing ellipsoid must grow to contain unseen points from the
 * same region (Buchner 2016, "A statistical test for nested sampling algorithms", Section 4):
 * `repeats` times, fit the enclosing ellipsoid to a resample with replacement and measure the
 * largest Mahalanobis distance^2 of the points left out. Returns the largest such value (>= 1), the
 * factor on the shape matrix.
 */
export function bootstrapExpansion(
  points: Float64Array,
  dim: number,
  indices: ArrayLike<number>,
  count: number,
  repeats: number,
  stream: SeededStream,
): number {
  let expansion = 1;
  const chosen = new Uint8Array(count);
  const selected = new Int32Array(count);
  const scratch = new Float64Array(dim);
  for (let repeat = 0; repeat < repeats; repeat++) {
    chosen.fill(0);
    for (let n = 0; n < count; n++) chosen[stream.integer(count)] = 1;
    let unique = 0;
    for (let n = 0; n < count; n++) if (chosen[n] === 1) selected[unique++] = indices[n];
    if (unique <= dim || unique === count) continue;
    const fit = enclosingEllipsoid(points, dim, selected, unique);
    for (let n = 0; n < count; n++) {
      if (chosen[n] === 1) continue;
      const distance = mahalanobisSquared(fit, points, indices[n] * dim, scratch);
      if (distance > expansion) expansion = distance;
    }
  }
  return expansion;
}

/**
 * The bounding ellipsoid of a cluster: the enclosing ellipsoid, grown by its bootstrap expansion
 * (when `bootstraps` > 0), its volume then multiplied by `enlargement` and raised to at least
 * e^{lnMinimumVolume}.
 */
export function boundingEllipsoid(
  points: Float64Array,
  dim: number,
  indices: ArrayLike<number>,
  count: number,
  enlargement: number,
  lnMinimumVolume: number,
  bootstraps = 0,
  stream?: SeededStream,
): Ellipsoid {
  const ellipsoid = enclosingEllipsoid(points, dim, indices, count);
  if (bootstraps > 0 && stream !== undefined) {
    const expansion = bootstrapExpansion(points, dim, indices, count, bootstraps, stream);
    scaleEllipsoidVolume(ellipsoid, 0.5 * dim * Math.log(expansion));
  }
  scaleEllipsoidVolume(ellipsoid, Math.log(enlargement));
  if (ellipsoid.lnVolume < lnMinimumVolume) scaleEllipsoidVolume(ellipsoid, lnMinimumVolume - ellipsoid.lnVolume);
  return ellipsoid;
}
