import type { PsfKernel } from './psfKernel.js';

/**
 * A PSF sampled `factor` times finer than the image (odd-sized, centred on its middle cell) as a
 * kernel on the image's pixels: its cells at whole-pixel offsets from the centre (every
 * `factor`-th cell), renormalised to sum 1. This is the PSF sampled at pixel centres, the
 * convention of the analytic PSFs (psfOfObservation): the forward model already averages the
 * light over each pixel, so integrating the PSF over the pixel as well would count the pixel box
 * twice (its variance larger by pixel^2 / 12). The result is odd-sized.
 */
export function pixelCentrePsf(oversampled: PsfKernel, factor: number): PsfKernel {
  const centreA = (oversampled.columns - 1) / 2;
  const centreB = (oversampled.rows - 1) / 2;
  const reachA = Math.floor(centreA / factor);
  const reachB = Math.floor(centreB / factor);
  const columns = 2 * reachA + 1;
  const rows = 2 * reachB + 1;
  const values = new Float64Array(columns * rows);
  let sum = 0;
  for (let b = 0; b < rows; b++) {
    for (let a = 0; a < columns; a++) {
      const v = oversampled.values[(centreB + factor * (b - reachB)) * oversampled.columns + centreA + factor * (a - reachA)];
      values[b * columns + a] = v;
      sum += v;
    }
  }
  for (let k = 0; k < values.length; k++) values[k] /= sum;
  return { columns, rows, values };
}
