import { boundingEllipsoid, mahalanobisSquared, sampleInEllipsoid, scaleEllipsoidVolume } from './ellipsoid.js';
import type { Ellipsoid } from './ellipsoid.js';
import { kMeansTwo } from '../../numeric/clustering/kMeansTwo.js';
import { logSumExp } from '../../numeric/statistics/logSumExp.js';
import type { SeededStream } from '../../numeric/random/seededStream.js';

/** A union of ellipsoids bounding the live points, with the volume-proportional choice table. */
export interface EllipsoidUnion {
  readonly dim: number;
  readonly ellipsoids: readonly Ellipsoid[];
  /** ln of the summed volumes (overlaps counted once per ellipsoid). */
  readonly lnVolumeSum: number;
  /** cumulative volume fractions, last entry 1. */
  readonly cumulativeFraction: Float64Array;
}

export interface EllipsoidUnionSettings {
  /** volume enlargement factor applied to every ellipsoid (>= 1). */
  readonly enlargement: number;
  /** bootstrap resamples behind each ellipsoid's expansion (see bootstrapExpansion); 0 for none. */
  readonly bootstraps: number;
  /** clusters smaller than this are never split further (at least dim + 1). */
  readonly minimumClusterSize: number;
  /**
   * Test hook only: multiply every ellipsoid's volume by this factor (< 1 shrinks the bound so
   * that it no longer covers the contour, a deliberately biased sampler). Default 1.
   */
  readonly volumeFactorForTesting?: number;
}

/** Collects ellipsoids into a union with its choice table. */
export function unionOfEllipsoids(dim: number, ellipsoids: readonly Ellipsoid[]): EllipsoidUnion {
  const lnVolumes = ellipsoids.map((ellipsoid) => ellipsoid.lnVolume);
  const lnVolumeSum = logSumExp(lnVolumes);
  const cumulativeFraction = new Float64Array(ellipsoids.length);
  let running = 0;
  for (let i = 0; i < ellipsoids.length; i++) {
    running += Math.exp(lnVolumes[i] - lnVolumeSum);
    cumulativeFraction[i] = running;
  }
  cumulativeFraction[ellipsoids.length - 1] = 1;
  return { dim, ellipsoids, lnVolumeSum, cumulativeFraction };
}

/** Draws used to estimate the fraction of an ellipsoid inside the unit cube. */
const cubeFractionDraws = 256;

/**
 * Multi-ellipsoid bound of the live points (Feroz & Hobson 2008, Section 5.1.2; Feroz, Hobson &
 * Bridges 2009, Section 5.2). Each cluster of n of the N points is bounded by its enclosing
 * ellipsoid grown by its bootstrap expansion, enlarged in volume by f, and raised to at least
 * f sqrt(N / n) times its expected volume X n / N (FHB 2009: fewer points bound less reliably). A cluster is split by two-cluster k-means
 * and both halves refined recursively when the split halves the volume at once, or when the part
 * of the ellipsoid inside the cube (estimated by `cubeFractionDraws` draws from `stream`) exceeds
 * twice its enlarged expected volume; the refinement is kept only if its summed volume is below
 * the cluster's own ellipsoid. The look-ahead resolves a regular grid of modes, whose first split
 * does not pay; the enlarged floors make needless splits of a convex region cost volume, so they are
 * refused. `points` holds `count` live points (rows of width dim) at prior volume e^{lnX}.
 */
export function buildEllipsoidUnion(
  points: Float64Array,
  dim: number,
  count: number,
  lnX: number,
  settings: EllipsoidUnionSettings,
  stream: SeededStream,
): EllipsoidUnion {
  const indices = new Int32Array(count);
  for (let i = 0; i < count; i++) indices[i] = i;
  const labels = new Uint8Array(count);
  const minimumSize = Math.max(dim + 1, settings.minimumClusterSize);
  const lnEnlargementOf = (size: number) => Math.log(settings.enlargement) + 0.5 * Math.log(count / size);
  const lnExpectedOf = (size: number) => lnX + Math.log(size / count);
  const bound = (members: Int32Array) => {
    const lnEnlargement = lnEnlargementOf(members.length);
    return boundingEllipsoid(
      points,
      dim,
      members,
      members.length,
      settings.enlargement,
      lnEnlargement + lnExpectedOf(members.length),
      settings.bootstraps,
      stream,
    );
  };
  const draw = new Float64Array(dim);
  const scratch = new Float64Array(dim);
  const lnInsideCube = (ellipsoid: Ellipsoid): number => {
    let inside = 0;
    for (let n = 0; n < cubeFractionDraws; n++) {
      sampleInEllipsoid(ellipsoid, stream, draw, scratch);
      let within = true;
      for (let i = 0; i < dim; i++) if (!(draw[i] >= 0 && draw[i] <= 1)) within = false;
      if (within) inside++;
    }
    return ellipsoid.lnVolume + Math.log(Math.max(inside, 1) / cubeFractionDraws);
  };
  const refine = (members: Int32Array, ellipsoid: Ellipsoid): Ellipsoid[] => {
    if (members.length < 2 * minimumSize) return [ellipsoid];
    const sizeZero = kMeansTwo(points, dim, members, members.length, labels);
    if (sizeZero < minimumSize || members.length - sizeZero < minimumSize) return [ellipsoid];
    const zero = new Int32Array(sizeZero);
    const one = new Int32Array(members.length - sizeZero);
    for (let n = 0, a = 0, b = 0; n < members.length; n++) {
      if (labels[n] === 0) zero[a++] = members[n];
      else one[b++] = members[n];
    }
    const zeroEllipsoid = bound(zero);
    const oneEllipsoid = bound(one);
    const lnHalves = logSumExp([zeroEllipsoid.lnVolume, oneEllipsoid.lnVolume]);
    const halves = lnHalves < ellipsoid.lnVolume - Math.LN2;
    if (!halves) {
      const lnEnlargedExpected = lnEnlargementOf(members.length) + lnExpectedOf(members.length);
      if (!(ellipsoid.lnVolume > Math.LN2 + lnEnlargedExpected && lnInsideCube(ellipsoid) > Math.LN2 + lnEnlargedExpected)) {
        return [ellipsoid];
      }
    }
    const refined = [...refine(zero, zeroEllipsoid), ...refine(one, oneEllipsoid)];
    const lnRefined = logSumExp(refined.map((part) => part.lnVolume));
    return lnRefined < ellipsoid.lnVolume ? refined : [ellipsoid];
  };
  const accepted = refine(indices, bound(indices));
  const factor = settings.volumeFactorForTesting ?? 1;
  if (factor !== 1) for (const ellipsoid of accepted) scaleEllipsoidVolume(ellipsoid, Math.log(factor));
  return unionOfEllipsoids(dim, accepted);
}

/**
 * A uniform draw from the union of ellipsoids (Feroz & Hobson 2008, Section 5.1.3): pick an
 * ellipsoid with probability proportional to its volume, draw uniformly inside it, and accept with
 * probability 1/q, q the number of ellipsoids containing the point; repeat until accepted.
 * `scratch` has length >= dim.
 */
export function sampleFromUnion(union: EllipsoidUnion, stream: SeededStream, out: Float64Array, scratch: Float64Array): void {
  const { ellipsoids, cumulativeFraction } = union;
  const last = ellipsoids.length - 1;
  for (;;) {
    const choice = stream.uniform();
    let chosen = 0;
    while (chosen < last && cumulativeFraction[chosen] <= choice) chosen++;
    sampleInEllipsoid(ellipsoids[chosen], stream, out, scratch);
    if (last === 0) return;
    let containing = 0;
    for (let e = 0; e <= last; e++) if (mahalanobisSquared(ellipsoids[e], out, 0, scratch) <= 1) containing++;
    if (containing <= 1 || stream.uniform() * containing < 1) return;
  }
}

/** Plain-number form of a union for checkpoints. */
export interface EllipsoidUnionRecord {
  readonly dim: number;
  readonly ellipsoids: ReadonlyArray<{ center: number[]; shape: number[]; factor: number[]; lnVolume: number }>;
}

export function recordEllipsoidUnion(union: EllipsoidUnion): EllipsoidUnionRecord {
  return {
    dim: union.dim,
    ellipsoids: union.ellipsoids.map((ellipsoid) => ({
      center: Array.from(ellipsoid.center),
      shape: Array.from(ellipsoid.shape),
      factor: Array.from(ellipsoid.factor),
      lnVolume: ellipsoid.lnVolume,
    })),
  };
}

/** Rebuilds a union from its record, bit for bit (the factor is stored, not recomputed). */
export function restoreEllipsoidUnion(record: EllipsoidUnionRecord): EllipsoidUnion {
  return unionOfEllipsoids(
    record.dim,
    record.ellipsoids.map((ellipsoid) => ({
      dim: record.dim,
      center: Float64Array.from(ellipsoid.center),
      shape: Float64Array.from(ellipsoid.shape),
      factor: Float64Array.from(ellipsoid.factor),
      lnVolume: ellipsoid.lnVolume,
    })),
  );
}
