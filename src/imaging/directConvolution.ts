import type { ImageConvolver } from './imageConvolver.js';
import type { PsfKernel } from './psfKernel.js';

/**
 * Direct (sum over kernel elements) discrete 2-D convolution with zero boundary, same-size
 * output (definition in imageConvolver.ts). The reference for the FFT path and the faster
 * choice for tiny kernels. Cost columns * rows * kernel size.
 */
export function directConvolution(
  input: Float64Array, columns: number, rows: number, kernel: PsfKernel, output: Float64Array,
): void {
  const kernelColumns = kernel.columns;
  const kernelRows = kernel.rows;
  const kernelValues = kernel.values;
  const centreA = (kernelColumns - 1) / 2;
  const centreB = (kernelRows - 1) / 2;
  output.fill(0, 0, columns * rows);
  for (let b = 0; b < kernelRows; b++) {
    const dy = b - centreB;
    // output row j reads input row j - dy; keep both inside the image.
    const jFirst = Math.max(0, dy);
    const jEnd = Math.min(rows, rows + dy);
    for (let a = 0; a < kernelColumns; a++) {
      const weight = kernelValues[b * kernelColumns + a];
      if (weight === 0) continue;
      const dx = a - centreA;
      const iFirst = Math.max(0, dx);
      const iEnd = Math.min(columns, columns + dx);
      for (let j = jFirst; j < jEnd; j++) {
        const outRow = j * columns;
        const inRow = (j - dy) * columns - dx;
        for (let i = iFirst; i < iEnd; i++) output[outRow + i] += weight * input[inRow + i];
      }
    }
  }
}

/** directConvolution behind the ImageConvolver interface. */
export class DirectConvolver implements ImageConvolver {
  readonly columns: number;
  readonly rows: number;
  private readonly kernel: PsfKernel;

  constructor(columns: number, rows: number, kernel: PsfKernel) {
    this.columns = columns;
    this.rows = rows;
    this.kernel = kernel;
  }

  convolve(input: Float64Array, output: Float64Array): void {
    directConvolution(input, this.columns, this.rows, this.kernel, output);
  }
}
