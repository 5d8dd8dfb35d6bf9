import type { CornerPair } from '../../results/cornerData.js';
import { MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D } from '../../results/densityLevels.js';
import { smoothHistogram2d } from '../../results/smoothHistogram2d.js';
import { contourRegion, type ContourRegion, type GridValues } from '../../numeric/contour/contourRegion.js';
import { enclosingLevels } from '../../numeric/statistics/enclosingLevels.js';

/** What a corner plot fills for one pair of parameters: the surface its regions are traced on and the two regions. */
export interface PairRegions {
  /** The bilinear density surface at `REFINEMENT` x `REFINEMENT` points per histogram bin. */
  readonly grid: GridValues;
  /** The region holding 86.5% of the histogram's mass (2-D 2 sigma). */
  readonly outer: ContourRegion;
  /** The region holding 39.3% of the histogram's mass (2-D 1 sigma). */
  readonly inner: ContourRegion;
}

/** Surface points per histogram bin along each axis. */
export const REFINEMENT = 4;

/**
 * The 39.3% and 86.5% highest-density regions of one corner pair, with smooth boundaries. The bin
 * densities (first smoothed by a Gaussian of `smoothingSigmaBins` bins when that is > 0, see
 * smoothHistogram2d) are taken at the bin centres, fall to 0 one bin beyond the histogram, and are
 * interpolated bilinearly to REFINEMENT x REFINEMENT points inside each bin. Each bin's UNSMOOTHED
 * mass is shared among its points in proportion to the unsmoothed surface (so a bin on a slope puts
 * more of its mass on its high side), and the levels are set so that the region above them holds
 * 39.3% and 86.5% of that mass (enclosingLevels). The traced regions so hold the stated fraction of
 * the samples whatever interpolation and smoothing do to their shape; levels taken from the
 * interpolated or smoothed surface's own mass would widen them (by a few per cent of the mass at
 * corner.json's 30 bins).
 */
export function cornerPairRegions(pair: CornerPair, smoothingSigmaBins = 0): PairRegions {
  const nx = pair.xEdges.length - 1;
  const ny = pair.yEdges.length - 1;
  const x0 = pair.xEdges[0];
  const y0 = pair.yEdges[0];
  const binX = (pair.xEdges[nx] - x0) / nx;
  const binY = (pair.yEdges[ny] - y0) / ny;
  let shape: ArrayLike<number> = pair.densities;
  if (smoothingSigmaBins > 0) {
    shape = smoothHistogram2d({
      xEdges: Float64Array.from(pair.xEdges),
      yEdges: Float64Array.from(pair.yEdges),
      xBinCount: nx,
      yBinCount: ny,
      densities: Float64Array.from(pair.densities),
      enclosedMass: 1,
    }, smoothingSigmaBins).densities;
  }
  const fx = nx * REFINEMENT;
  const fy = ny * REFINEMENT;
  const xCentres = Float64Array.from({ length: fx }, (_, a) => x0 + ((a + 0.5) * binX) / REFINEMENT);
  const yCentres = Float64Array.from({ length: fy }, (_, b) => y0 + ((b + 0.5) * binY) / REFINEMENT);
  const values = bilinearRefinement(shape, nx, ny);
  const raw = shape === pair.densities ? values : bilinearRefinement(pair.densities, nx, ny);
  // Each bin's mass, shared among its points in proportion to the unsmoothed surface there.
  const weights = new Float64Array(fx * fy);
  const binArea = binX * binY;
  for (let q = 0; q < ny; q++) {
    for (let p = 0; p < nx; p++) {
      let sum = 0;
      for (let b = q * REFINEMENT; b < (q + 1) * REFINEMENT; b++) for (let a = p * REFINEMENT; a < (p + 1) * REFINEMENT; a++) sum += raw[b * fx + a];
      const mass = pair.densities[q * nx + p] * binArea;
      for (let b = q * REFINEMENT; b < (q + 1) * REFINEMENT; b++) {
        for (let a = p * REFINEMENT; a < (p + 1) * REFINEMENT; a++) {
          weights[b * fx + a] = sum > 0 ? (mass * raw[b * fx + a]) / sum : mass / (REFINEMENT * REFINEMENT);
        }
      }
    }
  }
  const grid = { xCentres, yCentres, values };
  const [innerLevel, outerLevel] = enclosingLevels(values, weights, [MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D]);
  return { grid, outer: contourRegion(grid, outerLevel), inner: contourRegion(grid, innerLevel) };
}

// Bilinear interpolation of values at the bin centres (0 one bin beyond the edges) to REFINEMENT x
// REFINEMENT points per bin, each at the centre of its sub-cell.
function bilinearRefinement(densities: ArrayLike<number>, nx: number, ny: number): Float64Array {
  const coarse = (p: number, q: number): number => (p < 0 || q < 0 || p >= nx || q >= ny ? 0 : densities[q * nx + p]);
  const fx = nx * REFINEMENT;
  const fy = ny * REFINEMENT;
  const values = new Float64Array(fx * fy);
  for (let b = 0; b < fy; b++) {
    // Position in bin-centre units: bin q's centre sits at q.
    const t = (b + 0.5) / REFINEMENT - 0.5;
    const q = Math.floor(t);
    const v = t - q;
    for (let a = 0; a < fx; a++) {
      const s = (a + 0.5) / REFINEMENT - 0.5;
      const p = Math.floor(s);
      const u = s - p;
      values[b * fx + a] = (1 - u) * (1 - v) * coarse(p, q) + u * (1 - v) * coarse(p + 1, q)
        + (1 - u) * v * coarse(p, q + 1) + u * v * coarse(p + 1, q + 1);
    }
  }
  return values;
}
