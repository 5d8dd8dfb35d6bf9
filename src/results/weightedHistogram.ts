import { InputError, expectedFound } from '../errors.js';
import { checkWeightedValues } from '../numeric/statistics/sampleChecks.js';

/** A range [low, high] of one axis, low < high. */
export type AxisRange = readonly [number, number];

/** A 1-D weighted histogram normalised as a probability density. */
export interface Histogram1d {
  /** binCount + 1 bin edges, from range[0] to range[1] in equal steps. */
  readonly edges: Float64Array;
  /** binCount densities: weight in the bin / (total weight of ALL samples * bin width). */
  readonly densities: Float64Array;
  /** Fraction of the total weight inside the range (the integral of the densities). */
  readonly enclosedMass: number;
}

/** A 2-D weighted histogram normalised as a probability density. */
export interface Histogram2d {
  readonly xEdges: Float64Array;
  readonly yEdges: Float64Array;
  readonly xBinCount: number;
  readonly yBinCount: number;
  /**
   * Row-major densities: the cell of x bin ix and y bin iy is densities[iy * xBinCount + ix]
   * (rows are y bins, like image rows). Weight in the cell / (total weight * cell area).
   */
  readonly densities: Float64Array;
  /** Fraction of the total weight inside both ranges. */
  readonly enclosedMass: number;
}

/**
 * Histogram of weighted samples in `binCount` equal bins over `range`: each bin holds [left, right)
 * except the last, which also holds its right edge; values outside the range are left out (and
 * counted out of `enclosedMass`).
 */
export function weightedHistogram1d(
  values: ArrayLike<number>,
  weights: ArrayLike<number>,
  binCount: number,
  range: AxisRange,
): Histogram1d {
  const total = checkWeightedValues(values, weights);
  checkBinning(binCount, range, 'histogram');
  const sums = new Float64Array(binCount);
  const [low, high] = range;
  const binsPerUnit = binCount / (high - low);
  let inside = 0;
  for (let i = 0; i < values.length; i++) {
    const bin = binIndex(values[i], low, high, binsPerUnit, binCount);
    if (bin < 0) continue;
    sums[bin] += weights[i];
    inside += weights[i];
  }
  const densityScale = binsPerUnit / total;
  for (let bin = 0; bin < binCount; bin++) sums[bin] *= densityScale;
  return { edges: binEdges(binCount, range), densities: sums, enclosedMass: inside / total };
}

/** 2-D histogram of weighted samples (x, y) on equal bins; each axis bins as in `weightedHistogram1d`. */
export function weightedHistogram2d(
  xValues: ArrayLike<number>,
  yValues: ArrayLike<number>,
  weights: ArrayLike<number>,
  xBinCount: number,
  xRange: AxisRange,
  yBinCount: number,
  yRange: AxisRange,
): Histogram2d {
  const total = checkWeightedValues(xValues, weights, 'x samples');
  checkWeightedValues(yValues, weights, 'y samples');
  checkBinning(xBinCount, xRange, 'x axis of the histogram');
  checkBinning(yBinCount, yRange, 'y axis of the histogram');
  const [xLow, xHigh] = xRange;
  const [yLow, yHigh] = yRange;
  const xBinsPerUnit = xBinCount / (xHigh - xLow);
  const yBinsPerUnit = yBinCount / (yHigh - yLow);
  const sums = new Float64Array(xBinCount * yBinCount);
  let inside = 0;
  for (let i = 0; i < weights.length; i++) {
    const ix = binIndex(xValues[i], xLow, xHigh, xBinsPerUnit, xBinCount);
    if (ix < 0) continue;
    const iy = binIndex(yValues[i], yLow, yHigh, yBinsPerUnit, yBinCount);
    if (iy < 0) continue;
    sums[iy * xBinCount + ix] += weights[i];
    inside += weights[i];
  }
  const densityScale = (xBinsPerUnit * yBinsPerUnit) / total;
  for (let cell = 0; cell < sums.length; cell++) sums[cell] *= densityScale;
  return {
    xEdges: binEdges(xBinCount, xRange),
    yEdges: binEdges(yBinCount, yRange),
    xBinCount,
    yBinCount,
    densities: sums,
    enclosedMass: inside / total,
  };
}

/** Bin of `value`, or -1 outside [low, high]; the right edge belongs to the last bin. */
function binIndex(value: number, low: number, high: number, binsPerUnit: number, binCount: number): number {
  if (!(value >= low && value <= high)) return -1;
  const bin = Math.floor((value - low) * binsPerUnit);
  return bin < binCount ? bin : binCount - 1;
}

/** binCount + 1 equally spaced edges, the last exactly range[1]. */
function binEdges(binCount: number, range: AxisRange): Float64Array {
  const edges = new Float64Array(binCount + 1);
  const width = range[1] - range[0];
  for (let i = 0; i < binCount; i++) edges[i] = range[0] + (width * i) / binCount;
  edges[binCount] = range[1];
  return edges;
}

function checkBinning(binCount: number, range: AxisRange, what: string): void {
  if (!Number.isInteger(binCount) || binCount < 1) {
    throw new InputError(`${what}: bin count: ${expectedFound('an integer >= 1', binCount)}`);
  }
  if (!(Number.isFinite(range[0]) && Number.isFinite(range[1]) && range[0] < range[1])) {
    throw new InputError(`${what}: range: ${expectedFound('finite [low, high] with low < high', `[${range[0]}, ${range[1]}]`)}`);
  }
}
