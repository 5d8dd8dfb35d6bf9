import { InputError, expectedFound } from '../errors.js';
import type { Histogram2d } from './weightedHistogram.js';

/** The kernel is cut at this many sigma (the Gaussian's tails beyond hold < 1e-4 of it per axis). */
const KERNEL_HALF_WIDTH_SIGMA = 4;

/**
 * A 2-D histogram smoothed by a circular Gaussian of `sigmaBins` bins (the same number of bins along
 * x and y), applied as two 1-D passes of a kernel sampled at whole-bin offsets, cut at 4 sigma and
 * normalised to sum 1 (separability of the Gaussian: common practice). Cells beyond the edges count
 * as empty, so mass near an edge partly leaves the grid (`enclosedMass` is updated). sigmaBins = 0
 * returns a copy.
 */
export function smoothHistogram2d(histogram: Histogram2d, sigmaBins: number): Histogram2d {
  if (!(sigmaBins >= 0) || sigmaBins === Infinity) {
    throw new InputError(`smoothing sigma in bins: ${expectedFound('a finite number >= 0', sigmaBins)}`);
  }
  const { xBinCount, yBinCount } = histogram;
  const densities = Float64Array.from(histogram.densities);
  if (sigmaBins > 0) {
    const kernel = gaussianKernel(sigmaBins);
    const scratch = new Float64Array(Math.max(xBinCount, yBinCount));
    for (let iy = 0; iy < yBinCount; iy++) convolveLine(densities, iy * xBinCount, 1, xBinCount, kernel, scratch);
    for (let ix = 0; ix < xBinCount; ix++) convolveLine(densities, ix, xBinCount, yBinCount, kernel, scratch);
  }
  let sum = 0;
  for (let cell = 0; cell < densities.length; cell++) sum += densities[cell];
  const originalSum = histogram.densities.reduce((a, b) => a + b, 0);
  const enclosedMass = originalSum > 0 ? (histogram.enclosedMass * sum) / originalSum : histogram.enclosedMass;
  return { ...histogram, densities, enclosedMass };
}

/** Gaussian weights exp(-k^2 / (2 sigma^2)) for k = -h..h, h = ceil(4 sigma), normalised to sum 1. */
function gaussianKernel(sigmaBins: number): Float64Array {
  const halfWidth = Math.ceil(KERNEL_HALF_WIDTH_SIGMA * sigmaBins);
  const kernel = new Float64Array(2 * halfWidth + 1);
  let sum = 0;
  for (let k = -halfWidth; k <= halfWidth; k++) {
    const weight = Math.exp((-0.5 * k * k) / (sigmaBins * sigmaBins));
    kernel[k + halfWidth] = weight;
    sum += weight;
  }
  for (let i = 0; i < kernel.length; i++) kernel[i] /= sum;
  return kernel;
}

/** Convolves the `length` values at start, start + stride, ... with `kernel` in place (zero outside). */
function convolveLine(
  values: Float64Array,
  start: number,
  stride: number,
  length: number,
  kernel: Float64Array,
  scratch: Float64Array,
): void {
  const halfWidth = (kernel.length - 1) / 2;
  for (let i = 0; i < length; i++) {
    let sum = 0;
    const first = Math.max(0, i - halfWidth);
    const last = Math.min(length - 1, i + halfWidth);
    for (let j = first; j <= last; j++) sum += kernel[j - i + halfWidth] * values[start + j * stride];
    scratch[i] = sum;
  }
  for (let i = 0; i < length; i++) values[start + i * stride] = scratch[i];
}
