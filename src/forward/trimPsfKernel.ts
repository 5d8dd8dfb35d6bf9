import type { PsfKernel } from '../imaging/psfKernel.js';

/** A PSF kernel cut down to a centred box, and what was cut. */
export interface TrimmedPsfKernel {
  readonly kernel: PsfKernel;
  /** Sum of |values| left out, as a fraction of the sum of |values| of the input. */
  readonly droppedFraction: number;
}

/**
 * The smallest centred box of the kernel outside which the |values| sum to at most
 * `budget` times their total. Leaving them out changes a convolved pixel by at most
 * droppedFraction * (sum of |K|) * max |image| (triangle inequality), so a budget far below the
 * wanted accuracy makes the cut harmless while it shortens every convolution and shrinks the
 * area whose light must be computed. The box is kept odd and centred like the input.
 */
export function trimPsfKernel(kernel: PsfKernel, budget: number): TrimmedPsfKernel {
  const { columns, rows, values } = kernel;
  const centreA = (columns - 1) / 2;
  const centreB = (rows - 1) / 2;
  let total = 0;
  for (let k = 0; k < values.length; k++) total += Math.abs(values[k]);
  // Largest |offset| of each element from the centre, per axis; try boxes by growing half-size.
  let bestHalfX = centreA;
  let bestHalfY = centreB;
  let bestDropped = 0;
  const maxHalf = Math.max(centreA, centreB);
  for (let half = 0; half <= maxHalf; half++) {
    const halfX = Math.min(half, centreA);
    const halfY = Math.min(half, centreB);
    let dropped = 0;
    for (let b = 0; b < rows; b++) {
      for (let a = 0; a < columns; a++) {
        if (Math.abs(a - centreA) > halfX || Math.abs(b - centreB) > halfY) dropped += Math.abs(values[b * columns + a]);
      }
    }
    if (dropped <= budget * total) {
      bestHalfX = halfX;
      bestHalfY = halfY;
      bestDropped = dropped;
      break;
    }
  }
  const outColumns = 2 * bestHalfX + 1;
  const outRows = 2 * bestHalfY + 1;
  const out = new Float64Array(outColumns * outRows);
  for (let b = 0; b < outRows; b++) {
    for (let a = 0; a < outColumns; a++) {
      out[b * outColumns + a] = values[(b + centreB - bestHalfY) * columns + a + centreA - bestHalfX];
    }
  }
  return { kernel: { columns: outColumns, rows: outRows, values: out }, droppedFraction: total > 0 ? bestDropped / total : 0 };
}
