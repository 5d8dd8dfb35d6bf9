import type { PsfKernel } from './psfKernel.js';

/**
 * Weights of the cells of one oversampled axis inside one image pixel centred on a cell, by the
 * cell's offset k = -half..half from the pixel's centre cell: 1 for cells wholly inside, 1/2 for
 * the two cells the pixel edges cut in half (even factors only; for odd factors the edges fall
 * on cell edges). Each cell thus belongs to one pixel, or half to each of two, so flux is kept.
 */
function cellWeights(factor: number): Float64Array {
  const half = Math.floor(factor / 2);
  const weights = new Float64Array(2 * half + 1).fill(1);
  if (factor % 2 === 0) {
    weights[0] = 0.5;
    weights[2 * half] = 0.5;
  }
  return weights;
}

/** How many image pixels either side of the centre the downsampled kernel needs to hold every cell of `cells` (odd). */
function reachPixels(cells: number, factor: number): number {
  return Math.max(0, Math.ceil(((cells - 1) / 2 + 0.5 - factor / 2) / factor));
}

/** One axis at a time: sums `factor` cells (with cellWeights) about every `factor`-th cell from the centre. */
function downsampleRows(values: Float64Array, columns: number, rows: number, factor: number, weights: Float64Array, out: Float64Array, outColumns: number): void {
  const centre = (columns - 1) / 2;
  const reach = (outColumns - 1) / 2;
  const half = (weights.length - 1) / 2;
  for (let r = 0; r < rows; r++) {
    for (let a = 0; a < outColumns; a++) {
      const middle = centre + factor * (a - reach);
      let sum = 0;
      for (let k = -half; k <= half; k++) {
        const c = middle + k;
        if (c >= 0 && c < columns) sum += weights[k + half] * values[r * columns + c];
      }
      out[r * outColumns + a] = sum;
    }
  }
}

/**
 * A PSF sampled `factor` times finer than the image (odd-sized, centred on its middle cell, each
 * cell the PSF integrated over the cell) as a kernel on the image's pixels: the PSF integrated
 * over image pixels centred on the middle cell and every `factor` cells from it, that is, the
 * pixel-convolved PSF (the "effective PSF" of Anderson & King 2000, PASP 112, 1360; reference from memory)
 * sampled at pixel centres. Cells beyond the input count as 0, so the sum is kept exactly. The
 * result is odd-sized and holds every input cell.
 */
export function pixelIntegratedPsf(oversampled: PsfKernel, factor: number): PsfKernel {
  const weights = cellWeights(factor);
  const outColumns = 2 * reachPixels(oversampled.columns, factor) + 1;
  const outRows = 2 * reachPixels(oversampled.rows, factor) + 1;
  const alongRows = new Float64Array(outColumns * oversampled.rows);
  downsampleRows(oversampled.values, oversampled.columns, oversampled.rows, factor, weights, alongRows, outColumns);
  // The same sum down the columns: transpose, sum along rows, transpose back.
  const transposed = new Float64Array(alongRows.length);
  for (let r = 0; r < oversampled.rows; r++) for (let a = 0; a < outColumns; a++) transposed[a * oversampled.rows + r] = alongRows[r * outColumns + a];
  const summed = new Float64Array(outColumns * outRows);
  downsampleRows(transposed, oversampled.rows, outColumns, factor, weights, summed, outRows);
  const values = new Float64Array(outColumns * outRows);
  for (let a = 0; a < outColumns; a++) for (let b = 0; b < outRows; b++) values[b * outColumns + a] = summed[a * outRows + b];
  return { columns: outColumns, rows: outRows, values };
}
