import { describe, expect, it } from 'vitest';
import { bisectingClusters } from '../../../src/numeric/clustering/bisectingClusters.js';
import { projectionPrefersTwo } from '../../../src/numeric/clustering/projectionPrefersTwo.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';

/** `count` points per centre, standard normal spread `sigma` around each, in `dim` dimensions. */
function blobs(centres: number[][], count: number, sigma: number, seed: number): Float64Array {
  const dim = centres[0].length;
  const stream = SeededStream.fromSeed(seed);
  const rows = new Float64Array(centres.length * count * dim);
  centres.forEach((centre, c) => {
    for (let n = 0; n < count; n++) for (let i = 0; i < dim; i++) rows[(c * count + n) * dim + i] = centre[i] + sigma * stream.normal();
  });
  return rows;
}

describe('bisecting clusters with a projected two-Gaussian test', () => {
  it('finds two separated blobs in 20 dimensions from 25 points each', () => {
    // As the live points of the two 20-dimensional Gaussian shells: centres 7 apart, spread 0.45.
    const dim = 20;
    const rows = blobs([[-3.5, ...new Array(dim - 1).fill(0)], [3.5, ...new Array(dim - 1).fill(0)]], 25, 0.45, 1);
    const { labels, count } = bisectingClusters(rows, 50, dim, 3);
    expect(count).toBe(2);
    for (let n = 0; n < 50; n++) expect(labels[n]).toBe(n < 25 ? 0 : 1);
  });

  it('finds three blobs in a plane: no cluster spans two blobs, three clusters in most draws', () => {
    // A round blob of 40 points is now and then cut in two along the best k-means line (measured:
    // 1 of these 10 draws, seed 2); that costs slice chains nothing in correctness, since each
    // half inherits its share of the volume. Merging two blobs would be wrong, and never happens.
    let exact = 0;
    for (let seed = 1; seed <= 10; seed++) {
      const rows = blobs([[0, 0], [10, 0], [0, 10]], 40, 1, seed);
      const { labels, count } = bisectingClusters(rows, 120, 2, 3);
      const blobOf = new Map<number, number>();
      for (let n = 0; n < 120; n++) {
        const blob = Math.floor(n / 40);
        expect(blobOf.get(labels[n]) ?? blob).toBe(blob);
        blobOf.set(labels[n], blob);
      }
      if (count === 3) exact++;
    }
    expect(exact).toBeGreaterThanOrEqual(8);
  });

  it('leaves one Gaussian blob whole in 10 of 10 draws (the BIC margin of 10)', () => {
    for (let seed = 10; seed < 20; seed++) {
      const rows = blobs([new Array(13).fill(0)], 50, 1, seed);
      expect(bisectingClusters(rows, 50, 13, 3).count).toBe(1);
    }
  });

  it('prefers two Gaussians along a line for two clumps, one for a single clump', () => {
    const two = blobs([[-2], [2]], 100, 0.5, 3);
    const one = blobs([[0]], 200, 1, 4);
    const halvesOf = (rows: Float64Array) => {
      const halves = [new Float64Array(200), new Float64Array(200)];
      for (let n = 0; n < 200; n++) halves[rows[n] < 0 ? 0 : 1][n] = 1;
      return halves;
    };
    expect(projectionPrefersTwo(two, halvesOf(two), 200, 1)).toBe(true);
    expect(projectionPrefersTwo(one, halvesOf(one), 200, 1)).toBe(false);
  });
});
