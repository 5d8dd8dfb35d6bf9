import { kMeansTwo } from './kMeansTwo.js';
import { projectionPrefersTwo } from './projectionPrefersTwo.js';

/** Clusters of points: a label 0..count-1 per point, numbered in order of first appearance. */
export interface PointClusters {
  readonly labels: Int32Array;
  readonly count: number;
}

/**
 * Clusters of `count` points (rows of dim) by recursive bisection: a cluster is split by
 * two-cluster k-means (kMeansTwo) when both halves keep at least `minimumSize` points and the
 * points, projected on the line through the halves' means, are better described by two Gaussians
 * than by one (projectionPrefersTwo); the halves are then bisected in turn. Bisecting k-means
 * (Steinbach, Karypis & Kumar 2000) with the one-dimensional test of G-means (Hamerly & Elkan
 * 2003): it separates modes joined by a narrow neck as well as disjoint ones, and leaves a single
 * blob whole. Deterministic.
 */
export function bisectingClusters(rows: Float64Array, count: number, dim: number, minimumSize: number): PointClusters {
  const labels = new Int32Array(count);
  const pending: number[][] = [Array.from({ length: count }, (_, i) => i)];
  const done: number[][] = [];
  while (pending.length > 0) {
    const members = pending.pop()!;
    const halves = bisect(rows, dim, members, minimumSize);
    if (halves === null) done.push(members);
    else pending.push(halves[1], halves[0]);
  }
  done.sort((a, b) => a[0] - b[0]);
  done.forEach((members, label) => { for (const i of members) labels[i] = label; });
  return { labels, count: done.length };
}

/** The two halves of a cluster (ascending indices), or null when it stays whole. */
function bisect(rows: Float64Array, dim: number, members: number[], minimumSize: number): [number[], number[]] | null {
  const n = members.length;
  if (n < 2 * minimumSize) return null;
  const side = new Uint8Array(n);
  const sizeZero = kMeansTwo(rows, dim, members, n, side);
  if (sizeZero < minimumSize || n - sizeZero < minimumSize) return null;
  const subRows = new Float64Array(n * dim);
  const weights = [new Float64Array(n), new Float64Array(n)];
  members.forEach((row, m) => {
    subRows.set(rows.subarray(row * dim, row * dim + dim), m * dim);
    weights[side[m]][m] = 1;
  });
  if (!projectionPrefersTwo(subRows, weights, n, dim)) return null;
  const halves: [number[], number[]] = [[], []];
  members.forEach((row, m) => halves[side[m]].push(row));
  return halves;
}
