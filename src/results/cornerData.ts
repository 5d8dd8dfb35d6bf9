import { InputError, expectedFound } from '../errors.js';
import { densityLevels, MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D } from './densityLevels.js';
import { parameterColumn } from './parameterColumn.js';
import { parameterSummary, type ParameterSummary } from './parameterSummary.js';
import { checkRows, checkWeightedValues } from '../numeric/statistics/sampleChecks.js';
import { smoothHistogram2d } from './smoothHistogram2d.js';
import { weightedHistogram1d, weightedHistogram2d, type AxisRange } from './weightedHistogram.js';
import { weightedQuantiles } from './weightedQuantile.js';

/** Default quantiles bounding a parameter's plotted range, before padding. */
const RANGE_QUANTILES: readonly [number, number] = [0.001, 0.999];
/** Default padding of the plotted range on each side, as a fraction of its width. */
const RANGE_PADDING = 0.05;

export interface CornerOptions {
  /** Bins of each 1-D histogram; default 40. */
  readonly bins1d?: number;
  /** Bins along each axis of each 2-D histogram; default 30. */
  readonly bins2d?: number;
  /**
   * Plotted range per parameter; an entry left undefined (or the whole list) takes the default:
   * the 0.1% and 99.9% weighted quantiles, widened by 5% of their distance on each side.
   */
  readonly ranges?: readonly (AxisRange | undefined)[];
  /** Gaussian smoothing of the 2-D histograms in bins, applied before the levels; default 0 (off). */
  readonly smoothingSigmaBins?: number;
}

/** One parameter's panel on the diagonal. Plain numbers only, so JSON.stringify keeps it whole. */
export interface CornerParameter {
  readonly name: string;
  readonly unit: string;
  readonly range: [number, number];
  /** bins1d + 1 bin edges in the parameter's unit. */
  readonly edges: number[];
  /** bins1d posterior densities (per unit of the parameter). */
  readonly densities: number[];
  readonly summary: ParameterSummary;
}

/** One pair's panel below the diagonal: parameter xIndex across, parameter yIndex up. */
export interface CornerPair {
  readonly xIndex: number;
  readonly yIndex: number;
  readonly xEdges: number[];
  readonly yEdges: number[];
  /** Row-major densities (per x unit per y unit): cell (ix, iy) at densities[iy * (xEdges.length - 1) + ix]. */
  readonly densities: number[];
  /** Density whose super-level set {density >= it} holds 1 - exp(-1/2) = 39.3% of the mass (2-D 1 sigma). */
  readonly levelEnclosing393: number;
  /** Density whose super-level set holds 1 - exp(-2) = 86.5% of the mass (2-D 2 sigma). */
  readonly levelEnclosing865: number;
}

/** Everything a corner plot draws, as a plain JSON-able object. */
export interface CornerData {
  readonly parameters: CornerParameter[];
  /** One entry per pair xIndex < yIndex, ordered by yIndex then xIndex (the lower triangle, row by row). */
  readonly pairs: CornerPair[];
  /** Smoothing applied to the 2-D densities (and so to the levels), in bins; 0 = none. */
  readonly smoothingSigmaBins: number;
}

/**
 * Corner-plot data from weighted samples: `points` are `weights.length` rows of `names.length`
 * physical values; weights non-negative, any normalisation (equal weights for equal-weight
 * samples). 1-D panels carry the median and central 68% and 95% intervals; 2-D panels the
 * density levels of the 39.3% and 86.5% highest-density regions (see `densityLevels`).
 */
export function cornerData(
  names: readonly string[],
  units: readonly string[],
  points: ArrayLike<number>,
  weights: ArrayLike<number>,
  options: CornerOptions = {},
): CornerData {
  const dim = names.length;
  if (units.length !== dim) {
    throw new InputError(`corner data: units: ${expectedFound(`${dim} units, one per parameter name`, units.length)}`);
  }
  checkRows(points, weights.length, dim, 'corner data: points');
  const bins1d = options.bins1d ?? 40;
  const bins2d = options.bins2d ?? 30;
  const smoothingSigmaBins = options.smoothingSigmaBins ?? 0;
  const columns = names.map((_, index) => parameterColumn(points, dim, index));
  columns.forEach((column, index) => checkWeightedValues(column, weights, `corner data: parameter ${names[index]}`));
  const ranges = columns.map((column, index) => options.ranges?.[index] ?? defaultRange(column, weights));

  const parameters = columns.map((column, index): CornerParameter => {
    const histogram = weightedHistogram1d(column, weights, bins1d, ranges[index]);
    return {
      name: names[index],
      unit: units[index],
      range: [ranges[index][0], ranges[index][1]],
      edges: Array.from(histogram.edges),
      densities: Array.from(histogram.densities),
      summary: parameterSummary(column, weights),
    };
  });

  const pairs: CornerPair[] = [];
  for (let yIndex = 1; yIndex < dim; yIndex++) {
    for (let xIndex = 0; xIndex < yIndex; xIndex++) {
      const raw = weightedHistogram2d(
        columns[xIndex],
        columns[yIndex],
        weights,
        bins2d,
        ranges[xIndex],
        bins2d,
        ranges[yIndex],
      );
      const histogram = smoothingSigmaBins > 0 ? smoothHistogram2d(raw, smoothingSigmaBins) : raw;
      const [levelEnclosing393, levelEnclosing865] = densityLevels(histogram, {
        masses: [MASS_ONE_SIGMA_2D, MASS_TWO_SIGMA_2D],
      });
      pairs.push({
        xIndex,
        yIndex,
        xEdges: Array.from(histogram.xEdges),
        yEdges: Array.from(histogram.yEdges),
        densities: Array.from(histogram.densities),
        levelEnclosing393,
        levelEnclosing865,
      });
    }
  }
  return { parameters, pairs, smoothingSigmaBins };
}

/**
 * The 0.1%..99.9% weighted quantiles widened by 5% of their distance on each side; a parameter
 * whose samples all share one value v gets v -+ 5% of max(|v|, 1), so its panel is still drawable.
 */
function defaultRange(column: Float64Array, weights: ArrayLike<number>): AxisRange {
  const [low, high] = weightedQuantiles(column, weights, RANGE_QUANTILES);
  const width = high - low;
  const padding = width > 0 ? RANGE_PADDING * width : RANGE_PADDING * Math.max(Math.abs(low), 1);
  return [low - padding, high + padding];
}
