import type { PsfKernel } from '../imaging/psfKernel.js';
import type { SeparablePsf } from './separablePsf.js';

/**
 * Direct convolution (definition in src/imaging/imageConvolver.ts: zero outside the image,
 * kernel centred, not mirrored) evaluated only at a fixed list of output pixels, e.g. the used
 * pixels of a fit. The input lives in a zero-padded buffer (`input`, pixel (i, j) at
 * paddedIndex) so that the loops need no bounds checks. A separable kernel runs as two 1-D
 * passes: along x at every pixel within the kernel's half-height of an output pixel, then along
 * y at the output pixels (cost (2 halfX + 1) and (2 halfY + 1) per pixel instead of their
 * product). Everything is allocated here; convolve() allocates nothing.
 */
export class PixelSubsetConvolver {
  readonly columns: number;
  readonly rows: number;
  readonly halfX: number;
  readonly halfY: number;
  readonly paddedColumns: number;
  /** The image to convolve, zero-padded; write pixel p at paddedIndex(p). Zeros elsewhere stay. */
  readonly input: Float64Array;
  private readonly outputs: Int32Array;
  private readonly outputsPadded: Int32Array;
  private readonly alongX: Float64Array | undefined;
  private readonly alongY: Float64Array | undefined;
  private readonly passPadded: Int32Array;
  private readonly pass: Float64Array;
  private readonly offsets: Int32Array;
  private readonly weights: Float64Array;

  constructor(columns: number, rows: number, kernel: PsfKernel, outputs: Int32Array, separable?: SeparablePsf) {
    this.columns = columns;
    this.rows = rows;
    this.halfX = (kernel.columns - 1) / 2;
    this.halfY = (kernel.rows - 1) / 2;
    this.paddedColumns = columns + 2 * this.halfX;
    const paddedRows = rows + 2 * this.halfY;
    this.input = new Float64Array(this.paddedColumns * paddedRows);
    this.outputs = Int32Array.from(outputs);
    this.outputsPadded = this.outputs.map((p) => this.paddedIndex(p));
    this.alongX = separable?.alongX;
    this.alongY = separable?.alongY;
    if (separable !== undefined) {
      const wanted = new Uint8Array(columns * rows);
      for (const p of outputs) {
        const i = p % columns;
        const j = (p - i) / columns;
        for (let b = Math.max(0, j - this.halfY); b <= Math.min(rows - 1, j + this.halfY); b++) wanted[b * columns + i] = 1;
      }
      const list: number[] = [];
      for (let p = 0; p < wanted.length; p++) if (wanted[p] === 1) list.push(this.paddedIndex(p));
      this.passPadded = Int32Array.from(list);
      this.pass = new Float64Array(this.input.length);
      this.offsets = new Int32Array(0);
      this.weights = new Float64Array(0);
    } else {
      const offsets: number[] = [];
      const weights: number[] = [];
      for (let b = 0; b < kernel.rows; b++) {
        for (let a = 0; a < kernel.columns; a++) {
          const value = kernel.values[b * kernel.columns + a];
          if (value === 0) continue;
          // output(i, j) reads input(i - (a - halfX), j - (b - halfY)).
          offsets.push(-((b - this.halfY) * this.paddedColumns + (a - this.halfX)));
          weights.push(value);
        }
      }
      this.offsets = Int32Array.from(offsets);
      this.weights = Float64Array.from(weights);
      this.passPadded = new Int32Array(0);
      this.pass = new Float64Array(0);
    }
  }

  /** Index of row-major pixel p in the padded input. */
  paddedIndex(p: number): number {
    const i = p % this.columns;
    const j = (p - i) / this.columns;
    return (j + this.halfY) * this.paddedColumns + i + this.halfX;
  }

  /** Writes the convolution of `input` at each output pixel p into output[outputOffset + p]. */
  convolve(output: Float64Array, outputOffset: number): void {
    const input = this.input;
    const outputs = this.outputs;
    const outputsPadded = this.outputsPadded;
    const alongX = this.alongX;
    const alongY = this.alongY;
    if (alongX !== undefined && alongY !== undefined) {
      const pass = this.pass;
      const passPadded = this.passPadded;
      const halfX = this.halfX;
      const halfY = this.halfY;
      const width = this.paddedColumns;
      for (let e = 0; e < passPadded.length; e++) {
        const q = passPadded[e] + halfX;
        let sum = 0;
        for (let a = 0; a < alongX.length; a++) sum += alongX[a] * input[q - a];
        pass[passPadded[e]] = sum;
      }
      for (let e = 0; e < outputs.length; e++) {
        let q = outputsPadded[e] + halfY * width;
        let sum = 0;
        for (let b = 0; b < alongY.length; b++) {
          sum += alongY[b] * pass[q];
          q -= width;
        }
        output[outputOffset + outputs[e]] = sum;
      }
      return;
    }
    const offsets = this.offsets;
    const weights = this.weights;
    for (let e = 0; e < outputs.length; e++) {
      const q = outputsPadded[e];
      let sum = 0;
      for (let k = 0; k < offsets.length; k++) sum += weights[k] * input[q + offsets[k]];
      output[outputOffset + outputs[e]] = sum;
    }
  }
}
