import { checkProbability } from '../numeric/statistics/sampleChecks.js';
import { enclosingLevels } from '../numeric/statistics/enclosingLevels.js';
import { smoothHistogram2d } from './smoothHistogram2d.js';
import type { Histogram2d } from './weightedHistogram.js';

/** Mass inside the 1-sigma contour of a 2-D Gaussian, 1 - exp(-1/2) = 0.3935 (common practice). */
export const MASS_ONE_SIGMA_2D = 1 - Math.exp(-0.5);
/** Mass inside the 2-sigma contour of a 2-D Gaussian, 1 - exp(-2) = 0.8647 (common practice). */
export const MASS_TWO_SIGMA_2D = 1 - Math.exp(-2);

export interface DensityLevelOptions {
  /** Masses to enclose; default [1 - exp(-1/2), 1 - exp(-2)]. */
  readonly masses?: readonly number[];
  /**
   * Gaussian smoothing of the histogram before the levels are found, sigma in bins (see
   * `smoothHistogram2d`). Default 0: no smoothing.
   */
  readonly smoothingSigmaBins?: number;
}

/**
 * Highest-density-region thresholds of a 2-D histogram (common practice for corner plots): cells
 * are sorted by density, highest first, and their mass accumulated; the level for mass m is the
 * density of the cell at which the running mass first reaches m of the histogram's mass, so the
 * cells with density >= level form the smallest set of cells holding at least m. Returns one level
 * per mass, in the order given; NaN when the histogram holds no mass.
 */
export function densityLevels(histogram: Histogram2d, options: DensityLevelOptions = {}): number[] {
  const masses = options.masses ?? [MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D];
  for (const mass of masses) checkProbability(mass, 'enclosed mass of a density level');
  const smoothing = options.smoothingSigmaBins ?? 0;
  const densities = smoothing > 0 ? smoothHistogram2d(histogram, smoothing).densities : histogram.densities;
  return enclosingLevels(densities, densities, masses);
}
