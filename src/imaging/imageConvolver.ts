/**
 * Convolution of images of one fixed size with one fixed PSF kernel, `same`-size output:
 * output(i, j) = sum over kernel elements (a, b) of K(a, b) input(i - (a - ca), j - (b - cb)),
 * (ca, cb) the kernel centre, input zero outside the image. A point source at pixel (i, j)
 * becomes a copy of K centred on (i, j), not mirrored.
 */
export interface ImageConvolver {
  readonly columns: number;
  readonly rows: number;
  /** Writes the convolution of input into output (both columns * rows, row-major, distinct). */
  convolve(input: Float64Array, output: Float64Array): void;
}
