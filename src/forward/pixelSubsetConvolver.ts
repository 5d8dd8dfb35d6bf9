import type { PsfKernel } from '../imaging/psfKernel.js';
import { memoryWithRegions } from '../numeric/wasm/wasmMemory.js';
import { pairedConvolutionModule, type DirectPass, type GeneralX, type GeneralY, type MirroredX, type MirroredY } from './pairedConvolutionKernel.js';
import type { SeparablePsf } from './separablePsf.js';

/** The WebAssembly passes over two interleaved images (pairedConvolutionKernel.ts) and their memory. */
interface PairedPasses {
  readonly mirroredX: MirroredX;
  readonly mirroredY: MirroredY;
  readonly generalX: GeneralX;
  readonly generalY: GeneralY;
  readonly direct: DirectPass;
  /** Byte addresses: the pair planes, the point lists, the factors, the direct kernel. */
  readonly input: number;
  readonly pass: number;
  readonly sums: number;
  readonly passPoints: number;
  readonly outputPoints: number;
  readonly alongX: number;
  readonly alongY: number;
  readonly offsets: number;
  readonly weights: number;
  /** Pixel q of image l of the pair at inputView[2 q + l]; sums of output e at sumsView[2 e + l]. */
  readonly inputView: Float64Array;
  readonly sumsView: Float64Array;
}

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
  /** Padded indices of the outputs, of even length (see evenLength). */
  private readonly outputsPadded: Int32Array;
  private readonly alongX: Float64Array | undefined;
  private readonly alongY: Float64Array | undefined;
  /** Whether alongX, alongY equal their mirror images exactly (then each pass folds the taps). */
  private readonly mirroredX: boolean;
  private readonly mirroredY: boolean;
  private readonly passPadded: Int32Array;
  private readonly pass: Float64Array;
  private readonly offsets: Int32Array;
  private readonly weights: Float64Array;
  /** The convolution at each output pixel, in the order of `outputs`. */
  private readonly sums: Float64Array;
  /** Two images at once in WebAssembly (null without WebAssembly SIMD). */
  private readonly pairs: PairedPasses | null;
  /**
   * The input of convolvePair: pixel p of image l at pairInput[2 paddedIndex(p) + l], zeros
   * elsewhere staying (empty when there is no WebAssembly SIMD: check hasPairs).
   */
  readonly pairInput: Float64Array;

  constructor(columns: number, rows: number, kernel: PsfKernel, outputs: Int32Array, separable?: SeparablePsf) {
    this.columns = columns;
    this.rows = rows;
    this.halfX = (kernel.columns - 1) / 2;
    this.halfY = (kernel.rows - 1) / 2;
    this.paddedColumns = columns + 2 * this.halfX;
    const paddedRows = rows + 2 * this.halfY;
    this.input = new Float64Array(this.paddedColumns * paddedRows);
    this.outputs = Int32Array.from(outputs);
    this.outputsPadded = evenLength(this.outputs.map((p) => this.paddedIndex(p)));
    this.sums = new Float64Array(this.outputsPadded.length);
    this.alongX = separable?.alongX;
    this.alongY = separable?.alongY;
    this.mirroredX = this.alongX !== undefined && isMirrored(this.alongX);
    this.mirroredY = this.alongY !== undefined && isMirrored(this.alongY);
    if (separable !== undefined) {
      const wanted = new Uint8Array(columns * rows);
      for (const p of outputs) {
        const i = p % columns;
        const j = (p - i) / columns;
        for (let b = Math.max(0, j - this.halfY); b <= Math.min(rows - 1, j + this.halfY); b++) wanted[b * columns + i] = 1;
      }
      const list: number[] = [];
      for (let p = 0; p < wanted.length; p++) if (wanted[p] === 1) list.push(this.paddedIndex(p));
      this.passPadded = evenLength(Int32Array.from(list));
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
    this.pairs = this.pairedPasses(outputs.length);
    this.pairInput = this.pairs?.inputView ?? new Float64Array(0);
  }

  /** Whether convolvePair can run (WebAssembly SIMD is available). */
  get hasPairs(): boolean {
    return this.pairs !== null;
  }

  /** The paired passes' memory, filled with the point lists and factors; null without the module. */
  private pairedPasses(outputCount: number): PairedPasses | null {
    if (pairedConvolutionModule === null) return null;
    const separable = this.alongX !== undefined && this.alongY !== undefined;
    const passCount = separable ? this.passPadded.length : 0;
    const lengths = [
      16 * this.input.length, separable ? 16 * this.input.length : 0, 16 * this.outputsPadded.length,
      4 * passCount, 4 * this.outputsPadded.length,
      8 * (this.alongX?.length ?? 0), 8 * (this.alongY?.length ?? 0), 4 * this.offsets.length, 8 * this.weights.length,
    ];
    const { memory, starts } = memoryWithRegions(lengths);
    const [input, pass, sums, passPoints, outputPoints, alongX, alongY, offsets, weights] = starts;
    new Int32Array(memory.buffer, passPoints, passCount).set(this.passPadded.subarray(0, passCount));
    new Int32Array(memory.buffer, outputPoints, this.outputsPadded.length).set(this.outputsPadded);
    if (this.alongX !== undefined) new Float64Array(memory.buffer, alongX, this.alongX.length).set(this.alongX);
    if (this.alongY !== undefined) new Float64Array(memory.buffer, alongY, this.alongY.length).set(this.alongY);
    new Int32Array(memory.buffer, offsets, this.offsets.length).set(this.offsets);
    new Float64Array(memory.buffer, weights, this.weights.length).set(this.weights);
    const exports = new WebAssembly.Instance(pairedConvolutionModule, { env: { memory } }).exports;
    return {
      mirroredX: exports.mirroredX as MirroredX, mirroredY: exports.mirroredY as MirroredY,
      generalX: exports.generalX as GeneralX, generalY: exports.generalY as GeneralY, direct: exports.direct as DirectPass,
      input, pass, sums, passPoints, outputPoints, alongX, alongY, offsets, weights,
      inputView: new Float64Array(memory.buffer, input, 2 * this.input.length),
      sumsView: new Float64Array(memory.buffer, sums, 2 * outputCount),
    };
  }

  /**
   * convolve for two images at once, from pairInput: image 0 into output[offset0 + p], image 1
   * into output[offset1 + p] (and given `compact`, output pixel e at compact[compactOffset0 + e]
   * and compact[compactOffset1 + e]), each to the bit what convolve gives it alone; with output
   * null, the compact copies only. Only when hasPairs.
   */
  convolvePair(output: Float64Array | null, offset0: number, offset1: number, compact?: Float64Array, compactOffset0 = 0, compactOffset1 = 0): void {
    const pairs = this.pairs!;
    const outputCount = this.outputs.length;
    if (this.alongX !== undefined && this.alongY !== undefined) {
      const passCount = this.passPadded.length;
      if (this.mirroredX) pairs.mirroredX(pairs.passPoints, passCount, pairs.input, pairs.pass, pairs.alongX, this.halfX);
      else pairs.generalX(pairs.passPoints, passCount, pairs.input, pairs.pass, pairs.alongX, this.alongX.length, this.halfX);
      const evenCount = this.outputsPadded.length;
      if (this.mirroredY) pairs.mirroredY(pairs.outputPoints, evenCount, pairs.pass, pairs.sums, pairs.alongY, this.halfY, this.paddedColumns);
      else pairs.generalY(pairs.outputPoints, evenCount, pairs.pass, pairs.sums, pairs.alongY, this.alongY.length, this.halfY, this.paddedColumns);
    } else {
      pairs.direct(pairs.outputPoints, outputCount, pairs.input, pairs.sums, pairs.offsets, pairs.weights, this.offsets.length);
    }
    if (output !== null) this.scatterPair(pairs.sumsView, output, offset0, offset1);
    if (compact !== undefined) this.compactPair(pairs.sumsView, compact, compactOffset0, compactOffset1);
  }

  /** The pair sums, output by output, into compact[offset0 + e] and compact[offset1 + e]. */
  private compactPair(sums: Float64Array, compact: Float64Array, offset0: number, offset1: number): void {
    const count = this.outputs.length;
    for (let e = 0; e < count; e++) {
      compact[offset0 + e] = sums[2 * e];
      compact[offset1 + e] = sums[2 * e + 1];
    }
  }

  /** The pair sums into the two outputs. */
  private scatterPair(sums: Float64Array, output: Float64Array, offset0: number, offset1: number): void {
    const outputs = this.outputs;
    for (let e = 0; e < outputs.length; e++) {
      output[offset0 + outputs[e]] = sums[2 * e];
      output[offset1 + outputs[e]] = sums[2 * e + 1];
    }
  }

  /** Index of row-major pixel p in the padded input. */
  paddedIndex(p: number): number {
    const i = p % this.columns;
    const j = (p - i) / this.columns;
    return (j + this.halfY) * this.paddedColumns + i + this.halfX;
  }

  /**
   * Writes the convolution of `input` at each output pixel p into output[outputOffset + p] (unless
   * output is null), and (given `compact`) at the e-th output pixel into compact[compactOffset + e]. The
   * 1-D passes sum two points at a time (each point's sum in the same order as alone), so that
   * their additions overlap instead of waiting on one sum (a loop tap by tap over all points was
   * slower). A factor equal to its mirror image (a centred Gaussian) adds each tap pair's inputs
   * before multiplying. DEVELOPERS.md (measured choices) has the timings. Each loop is a method
   * of its own (see latticeLevel in adaptivePixelMeans.ts).
   */
  convolve(output: Float64Array | null, outputOffset: number, compact?: Float64Array, compactOffset = 0): void {
    const alongX = this.alongX;
    const alongY = this.alongY;
    if (alongX !== undefined && alongY !== undefined) {
      if (this.mirroredX) this.firstPassMirrored(alongX);
      else this.firstPass(alongX);
      if (this.mirroredY) this.secondPassMirrored(alongY);
      else this.secondPass(alongY);
    } else {
      this.directPass();
    }
    if (output !== null) this.scatter(output, outputOffset);
    if (compact !== undefined) this.compactSums(compact, compactOffset);
  }

  /** `sums` into compact[offset + e] (a loop: a subarray view would be an allocation per call). */
  private compactSums(compact: Float64Array, offset: number): void {
    const sums = this.sums;
    for (let e = 0; e < this.outputs.length; e++) compact[offset + e] = sums[e];
  }

  /** Along x at every point of passPadded, into `pass`, two points at a time (see evenLength). */
  private firstPass(alongX: Float64Array): void {
    const input = this.input, pass = this.pass, points = this.passPadded;
    const taps = alongX.length;
    const halfX = this.halfX;
    for (let e = 0; e < points.length; e += 2) {
      const q0 = points[e] + halfX, q1 = points[e + 1] + halfX;
      let sum0 = 0, sum1 = 0;
      for (let a = 0; a < taps; a++) {
        const w = alongX[a];
        sum0 += w * input[q0 - a];
        sum1 += w * input[q1 - a];
      }
      pass[q0 - halfX] = sum0;
      pass[q1 - halfX] = sum1;
    }
  }

  /** Along y of `pass` at the output pixels, into `sums`, two pixels at a time. */
  private secondPass(alongY: Float64Array): void {
    const pass = this.pass, sums = this.sums, points = this.outputsPadded;
    const taps = alongY.length;
    const width = this.paddedColumns;
    const top = this.halfY * width;
    for (let e = 0; e < points.length; e += 2) {
      let q0 = points[e] + top, q1 = points[e + 1] + top;
      let sum0 = 0, sum1 = 0;
      for (let b = 0; b < taps; b++) {
        const w = alongY[b];
        sum0 += w * pass[q0];
        sum1 += w * pass[q1];
        q0 -= width;
        q1 -= width;
      }
      sums[e] = sum0;
      sums[e + 1] = sum1;
    }
  }

  /**
   * firstPass for a factor equal to its mirror image (w_a = w_(taps-1-a), e.g. any centred
   * Gaussian): the two inputs a tap pair multiplies are added first, about half the
   * multiplications (the sums differ from firstPass's by rounding only).
   */
  private firstPassMirrored(alongX: Float64Array): void {
    const input = this.input, pass = this.pass, points = this.passPadded;
    const halfX = this.halfX;
    const centre = alongX[halfX];
    for (let e = 0; e < points.length; e += 2) {
      const q0 = points[e], q1 = points[e + 1];
      let sum0 = centre * input[q0], sum1 = centre * input[q1];
      for (let a = 1; a <= halfX; a++) {
        const w = alongX[halfX - a];
        sum0 += w * (input[q0 - a] + input[q0 + a]);
        sum1 += w * (input[q1 - a] + input[q1 + a]);
      }
      pass[q0] = sum0;
      pass[q1] = sum1;
    }
  }

  /** secondPass for a factor equal to its mirror image (see firstPassMirrored). */
  private secondPassMirrored(alongY: Float64Array): void {
    const pass = this.pass, sums = this.sums, points = this.outputsPadded;
    const width = this.paddedColumns;
    const halfY = this.halfY;
    const centre = alongY[halfY];
    for (let e = 0; e < points.length; e += 2) {
      const q0 = points[e], q1 = points[e + 1];
      let sum0 = centre * pass[q0], sum1 = centre * pass[q1];
      for (let b = 1, step = width; b <= halfY; b++, step += width) {
        const w = alongY[halfY - b];
        sum0 += w * (pass[q0 - step] + pass[q0 + step]);
        sum1 += w * (pass[q1 - step] + pass[q1 + step]);
      }
      sums[e] = sum0;
      sums[e + 1] = sum1;
    }
  }

  /** The whole kernel at the output pixels, into `sums`. */
  private directPass(): void {
    const input = this.input, sums = this.sums, points = this.outputsPadded;
    const offsets = this.offsets, weights = this.weights;
    for (let e = 0; e < points.length; e++) {
      const q = points[e];
      let sum = 0;
      for (let k = 0; k < offsets.length; k++) sum += weights[k] * input[q + offsets[k]];
      sums[e] = sum;
    }
  }

  /** `sums` into output[outputOffset + p] at the output pixels p. */
  private scatter(output: Float64Array, outputOffset: number): void {
    const sums = this.sums, outputs = this.outputs;
    for (let e = 0; e < outputs.length; e++) output[outputOffset + outputs[e]] = sums[e];
  }
}

/** Whether w_a = w_(n-1-a) exactly for every a (n odd). */
function isMirrored(weights: Float64Array): boolean {
  for (let a = 0; a < weights.length; a++) if (weights[a] !== weights[weights.length - 1 - a]) return false;
  return weights.length % 2 === 1;
}

/** The list, its last entry repeated once if its length is odd (so passes can go two points at a time; the repeat computes the same value twice). */
function evenLength(list: Int32Array): Int32Array {
  if (list.length % 2 === 0) return list;
  const even = new Int32Array(list.length + 1);
  even.set(list);
  even[list.length] = list.length > 0 ? list[list.length - 1] : 0;
  return even;
}
