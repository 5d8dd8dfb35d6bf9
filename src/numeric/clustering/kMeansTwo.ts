/**
 * Two-cluster k-means (Lloyd 1982) of the rows `indices[0..count)` of `points` (width dim), with a
 * deterministic start: the point farthest from the mean, then the point farthest from that one.
 * Writes 0 or 1 per listed point into `labels` and returns the size of cluster 0.
 */
export function kMeansTwo(
  points: Float64Array,
  dim: number,
  indices: ArrayLike<number>,
  count: number,
  labels: Uint8Array,
  maxIterations = 100,
): number {
  const mean = new Float64Array(dim);
  for (let n = 0; n < count; n++) {
    const row = indices[n] * dim;
    for (let i = 0; i < dim; i++) mean[i] += points[row + i] / count;
  }
  const first = farthestFrom(points, dim, indices, count, mean, 0);
  const firstCenter = points.slice(indices[first] * dim, indices[first] * dim + dim);
  const second = farthestFrom(points, dim, indices, count, firstCenter, 0);
  const centers = [firstCenter, points.slice(indices[second] * dim, indices[second] * dim + dim)];
  labels.fill(255, 0, count);
  let sizeZero = 0;
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    let changed = false;
    sizeZero = 0;
    for (let n = 0; n < count; n++) {
      const row = indices[n] * dim;
      const label = squaredDistance(points, row, centers[0], dim) <= squaredDistance(points, row, centers[1], dim) ? 0 : 1;
      if (label !== labels[n]) changed = true;
      labels[n] = label;
      if (label === 0) sizeZero++;
    }
    if (!changed || sizeZero === 0 || sizeZero === count) break;
    centers[0].fill(0);
    centers[1].fill(0);
    for (let n = 0; n < count; n++) {
      const row = indices[n] * dim;
      const center = centers[labels[n]];
      for (let i = 0; i < dim; i++) center[i] += points[row + i];
    }
    for (let i = 0; i < dim; i++) {
      centers[0][i] /= sizeZero;
      centers[1][i] /= count - sizeZero;
    }
  }
  return sizeZero;
}

function squaredDistance(points: Float64Array, row: number, center: Float64Array, dim: number): number {
  let sum = 0;
  for (let i = 0; i < dim; i++) {
    const difference = points[row + i] - center[i];
    sum += difference * difference;
  }
  return sum;
}

function farthestFrom(
  points: Float64Array,
  dim: number,
  indices: ArrayLike<number>,
  count: number,
  center: Float64Array,
  fallback: number,
): number {
  let best = fallback;
  let bestDistance = -1;
  for (let n = 0; n < count; n++) {
    const distance = squaredDistance(points, indices[n] * dim, center, dim);
    if (distance > bestDistance) {
      bestDistance = distance;
      best = n;
    }
  }
  return best;
}
