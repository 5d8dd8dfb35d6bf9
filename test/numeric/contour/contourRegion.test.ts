import normal from '@stdlib/random/base/normal';
import { describe, expect, it } from 'vitest';
import { cornerData, MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D } from '../../../src/results/index.js';
import { binCentres, contourRegion } from '../../../src/numeric/contour/contourRegion.js';
import { cornerPairRegions } from '../../../src/report/plots/cornerPairRegions.js';

// A correlated 2-D Gaussian, sigma_x = 1, sigma_y = 2, correlation 0.7, drawn through the Cholesky
// factor x = z1, y = 2 (0.7 z1 + sqrt(1 - 0.49) z2) (common practice).
function correlatedGaussian(count: number, seed: number): Float64Array {
  const draw = normal.factory(0, 1, { seed });
  const points = new Float64Array(2 * count);
  const mix = Math.sqrt(1 - 0.49);
  for (let i = 0; i < count; i++) {
    const z1 = draw();
    const z2 = draw();
    points[2 * i] = z1;
    points[2 * i + 1] = 2 * (0.7 * z1 + mix * z2);
  }
  return points;
}

// Even-odd rule by ray casting (Shimrat 1962, "Algorithm 112: position of point relative to polygon"):
// a point is inside when a ray from it crosses the boundary an odd number of times.
function insideLoops(loops: readonly Float64Array[], x: number, y: number): boolean {
  let inside = false;
  for (const loop of loops) {
    const n = loop.length / 2;
    for (let a = 0, b = n - 1; a < n; b = a++) {
      const xa = loop[2 * a];
      const ya = loop[2 * a + 1];
      const xb = loop[2 * b];
      const yb = loop[2 * b + 1];
      if (ya > y !== yb > y && x < ((xb - xa) * (y - ya)) / (yb - ya) + xa) inside = !inside;
    }
  }
  return inside;
}

// Shoelace formula: twice the signed area, positive for a counter-clockwise loop (common practice).
function signedArea(loop: Float64Array): number {
  let twice = 0;
  const n = loop.length / 2;
  for (let a = 0, b = n - 1; a < n; b = a++) twice += loop[2 * b] * loop[2 * a + 1] - loop[2 * a] * loop[2 * b + 1];
  return twice / 2;
}

describe('contourRegion', () => {
  it('traces a circle of the right radius, counter-clockwise, on a cone', () => {
    // v = -sqrt(x^2 + y^2) is linear along every radius, so the level -r gives a loop whose points
    // lie on the circle of radius r up to the chord error of linear interpolation along the grid
    // edges (at most h^2 / (8 r) for spacing h; the cone's curvature across a grid edge is 1 / r).
    const h = 0.1;
    const centres = Float64Array.from({ length: 41 }, (_, k) => -2 + k * h);
    const values = new Float64Array(41 * 41);
    for (let j = 0; j < 41; j++) for (let i = 0; i < 41; i++) values[j * 41 + i] = -Math.hypot(centres[i], centres[j]);
    const r = 1.23;
    const { loops } = contourRegion({ xCentres: centres, yCentres: centres, values }, -r, -10);
    expect(loops.length).toBe(1);
    const loop = loops[0];
    for (let k = 0; k < loop.length; k += 2) {
      const distance = Math.hypot(loop[k], loop[k + 1]);
      expect(distance).toBeLessThanOrEqual(r + 1e-12);
      expect(distance).toBeGreaterThan(r - (h * h) / (8 * r) - 1e-12);
    }
    // Polygon inscribed in the circle: its area is below pi r^2 by at most the chord error times the perimeter.
    const area = signedArea(loop);
    expect(area).toBeGreaterThan(0);
    expect(area).toBeLessThan(Math.PI * r * r);
    expect(area).toBeGreaterThan(Math.PI * r * r - 2 * Math.PI * r * ((h * h) / (8 * r)) - 1e-9);
  });

  it('gives a hole a clockwise loop inside the counter-clockwise outer one', () => {
    // A bowl v = x^2 + y^2 above the level r^2: the region is the grid minus a disc, so there is an
    // outer boundary (the zero ring padded round the grid) and a hole around the disc.
    const centres = Float64Array.from({ length: 21 }, (_, k) => -1 + k * 0.1);
    const values = new Float64Array(21 * 21);
    for (let j = 0; j < 21; j++) for (let i = 0; i < 21; i++) values[j * 21 + i] = centres[i] ** 2 + centres[j] ** 2;
    const { loops } = contourRegion({ xCentres: centres, yCentres: centres, values }, 0.25);
    expect(loops.length).toBe(2);
    const areas = loops.map(signedArea).sort((a, b) => a - b);
    expect(areas[0]).toBeLessThan(0);
    expect(areas[0]).toBeGreaterThan(-Math.PI * 0.25);
    expect(areas[1]).toBeGreaterThan(2 * 2);
    expect(insideLoops(loops, 0, 0)).toBe(false);
    expect(insideLoops(loops, 0.9, 0.9)).toBe(true);
  });

  it('joins the two high corners of a saddle square', () => {
    // values (0,0) = 1, (1,0) = 0, (0,1) = 0, (1,1) = 1 at level 0.5: the centre square is a saddle.
    // Joining the high corners gives one region (and one loop), with the square's centre inside.
    const { loops } = contourRegion({ xCentres: [0, 1], yCentres: [0, 1], values: [1, 0, 0, 1] }, 0.5);
    expect(loops.length).toBe(1);
    expect(insideLoops(loops, 0.5, 0.5)).toBe(true);
    expect(insideLoops(loops, 1, 0)).toBe(false);
  });

  it('returns no loop for a level above every value or a NaN level', () => {
    expect(contourRegion({ xCentres: [0, 1], yCentres: [0, 1], values: [1, 2, 3, 4] }, 5).loops).toEqual([]);
    expect(contourRegion({ xCentres: [0, 1], yCentres: [0, 1], values: [1, 2, 3, 4] }, NaN).loops).toEqual([]);
  });
});

// The correlated Gaussian's density (sigma_x = 1, sigma_y = 2, covariance 1.4), for weighting a lattice.
function gaussianDensity(x: number, y: number): number {
  const det = 4 - 1.4 * 1.4;
  return Math.exp(-(4 * x * x - 2.8 * x * y + y * y) / (2 * det)) / (2 * Math.PI * Math.sqrt(det));
}

/** Fraction of `points` (flat x, y pairs) inside the even-odd region of `loops`. */
function fractionInside(loops: readonly Float64Array[], points: Float64Array): number {
  let inside = 0;
  for (let i = 0; i < points.length; i += 2) if (insideLoops(loops, points[i], points[i + 1])) inside++;
  return inside / (points.length / 2);
}

const MASSES = [MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D];

describe('the regions a corner plot fills', () => {
  const freshCount = 200_000;
  const fresh = correlatedGaussian(freshCount, 22);
  const firstCount = 400_000;
  const first = correlatedGaussian(firstCount, 21);

  it('hold 39.3% and 86.5% of fresh samples when the histogram is exact, smoothed or not', () => {
    // Weighted "samples" on a lattice of 4 x 4 points per bin, weighted by the density, give a
    // histogram with no sampling noise (midpoint rule, error ~ (bin / 4)^2 of each bin's mass), on
    // 80 bins over +-4 sigma. The only noise left is the fresh set's: each region's fraction of it is
    // binomial, so |fraction - m| must be below 4 sigma = 4 sqrt(m (1 - m) / 200,000) = 0.0044 (inner)
    // and 0.0031 (outer). Smoothing (1 bin) may change the outline, not the mass held.
    const bins = 80;
    const perBin = 4;
    const n = bins * perBin;
    const points = new Float64Array(2 * n * n);
    const weights = new Float64Array(n * n);
    for (let j = 0; j < n; j++) {
      for (let i = 0; i < n; i++) {
        const x = -4 + ((i + 0.5) * 8) / n;
        const y = -8 + ((j + 0.5) * 16) / n;
        points[2 * (j * n + i)] = x;
        points[2 * (j * n + i) + 1] = y;
        weights[j * n + i] = gaussianDensity(x, y);
      }
    }
    const data = cornerData(['x', 'y'], ['', ''], points, weights, { bins2d: bins, ranges: [[-4, 4], [-8, 8]] });
    for (const smoothing of [0, 1]) {
      const regions = cornerPairRegions(data.pairs[0], smoothing);
      [regions.inner, regions.outer].forEach((region, k) => {
        const sigma = Math.sqrt((MASSES[k] * (1 - MASSES[k])) / freshCount);
        expect(Math.abs(fractionInside(region.loops, fresh) - MASSES[k])).toBeLessThan(4 * sigma);
      });
    }
  });

  it('hold 39.3% and 86.5% of fresh samples when drawn from random samples on corner.json binning', () => {
    // 400,000 equal-weight samples binned as corner.json bins them by default (30 bins over the
    // 0.1% to 99.9% quantiles plus 5%), as the report draws them (smoothing 1 bin). Allowed: 4 sigma
    // of the binomial noise of both sets, plus the mass of the heaviest bin, the resolution at which
    // a 30-bin histogram knows where a region's edge lies (on the lattice above, 80 bins, the
    // regions were exact to the fresh set's noise; at 30 bins errors of about half a bin's mass
    // remain, measured between -0.5% and +0.6% depending on where the bin edges fall).
    const data = cornerData(['x', 'y'], ['', ''], first, new Float64Array(firstCount).fill(1));
    const pair = data.pairs[0];
    const binArea = (pair.xEdges[1] - pair.xEdges[0]) * (pair.yEdges[1] - pair.yEdges[0]);
    const heaviestBin = Math.max(...pair.densities) * binArea;
    expect(heaviestBin).toBeLessThan(0.015);
    const regions = cornerPairRegions(pair, 1);
    [regions.inner, regions.outer].forEach((region, k) => {
      const sigma = Math.sqrt(MASSES[k] * (1 - MASSES[k]) * (1 / firstCount + 1 / freshCount));
      expect(Math.abs(fractionInside(region.loops, fresh) - MASSES[k])).toBeLessThan(4 * sigma + heaviestBin);
    });
  });

  it('would miss by more than that allowance with levels taken from the smoothed surface itself', () => {
    // The check above can fail: the usual shortcut, levels from the smoothed histogram's own mass
    // (densityLevels after smoothHistogram2d), widens a Gaussian's regions by the kernel's
    // variance; at 30 bins and 1 bin of smoothing the inner region then holds about 3.5% too much.
    const data = cornerData(['x', 'y'], ['', ''], first, new Float64Array(firstCount).fill(1), { smoothingSigmaBins: 1 });
    const pair = data.pairs[0];
    const grid = { xCentres: binCentres(pair.xEdges), yCentres: binCentres(pair.yEdges), values: pair.densities };
    const binArea = (pair.xEdges[1] - pair.xEdges[0]) * (pair.yEdges[1] - pair.yEdges[0]);
    const heaviestBin = Math.max(...pair.densities) * binArea;
    const inner = contourRegion(grid, pair.levelEnclosing393);
    const sigma = Math.sqrt(MASSES[0] * (1 - MASSES[0]) * (1 / firstCount + 1 / freshCount));
    expect(fractionInside(inner.loops, fresh) - MASSES[0]).toBeGreaterThan(4 * sigma + heaviestBin);
  });
});
