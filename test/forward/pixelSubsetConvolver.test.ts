import { describe, expect, it } from 'vitest';
import { PixelSubsetConvolver } from '../../src/forward/pixelSubsetConvolver.js';
import { separablePsf } from '../../src/forward/separablePsf.js';
import type { PsfKernel } from '../../src/imaging/psfKernel.js';

/**
 * The discrete convolution by its definition (zero outside the image, kernel centred, not
 * mirrored; common practice, as in src/imaging/imageConvolver.ts): output(i, j) = sum over the
 * kernel of K(a, b) input(i - (a - halfX), j - (b - halfY)).
 */
function definition(input: Float64Array, columns: number, rows: number, kernel: PsfKernel, i: number, j: number): number {
  const halfX = (kernel.columns - 1) / 2, halfY = (kernel.rows - 1) / 2;
  let sum = 0;
  for (let b = 0; b < kernel.rows; b++) {
    for (let a = 0; a < kernel.columns; a++) {
      const ii = i - (a - halfX), jj = j - (b - halfY);
      if (ii < 0 || ii >= columns || jj < 0 || jj >= rows) continue;
      sum += kernel.values[b * kernel.columns + a] * input[jj * columns + ii];
    }
  }
  return sum;
}

/** The outer product u v^T as a kernel (u along x, v along y). */
function outer(u: number[], v: number[]): PsfKernel {
  const values = new Float64Array(u.length * v.length);
  for (let b = 0; b < v.length; b++) for (let a = 0; a < u.length; a++) values[b * u.length + a] = u[a] * v[b];
  return { columns: u.length, rows: v.length, values };
}

describe('convolution at a subset of pixels', () => {
  const columns = 23, rows = 19;
  const input = Float64Array.from({ length: columns * rows }, (_, p) => Math.sin(0.37 * p) + 0.2 * ((p * 7919) % 13));
  // Every third pixel, edges included, and an odd count (the passes go two pixels at a time).
  const outputs = Int32Array.from({ length: Math.ceil((columns * rows) / 3) }, (_, e) => 3 * e);

  const kernels: [string, PsfKernel][] = [
    ['a full kernel that is not separable', { columns: 5, rows: 3, values: Float64Array.from({ length: 15 }, (_, k) => 1 + ((k * 5) % 7)) }],
    ['a separable kernel that is not mirror-symmetric', outer([0.1, 0.5, 0.3, 0.2, 0.05], [0.2, 0.7, 0.4])],
    ['a mirror-symmetric separable kernel (folded taps)', outer([0.05, 0.25, 0.4, 0.25, 0.05], [0.1, 0.2, 0.4, 0.2, 0.1])],
  ];
  for (const [name, kernel] of kernels) {
    it(`equals the definition at the listed pixels for ${name}`, () => {
      const factors = separablePsf(kernel, 1e-12);
      expect(factors === undefined).toBe(name.startsWith('a full'));
      const convolver = new PixelSubsetConvolver(columns, rows, kernel, outputs, factors);
      for (let p = 0; p < input.length; p++) convolver.input[convolver.paddedIndex(p)] = input[p];
      const output = new Float64Array(columns * rows).fill(Number.NaN);
      convolver.convolve(output, 0);
      for (const p of outputs) {
        const expected = definition(input, columns, rows, kernel, p % columns, Math.floor(p / columns));
        // Rounding only: the passes add the same products in another order.
        expect(Math.abs(output[p] - expected)).toBeLessThan(1e-13 * (1 + Math.abs(expected)));
      }
      expect(Number.isNaN(output[1])).toBe(true);
    });
  }

  for (const [name, kernel] of kernels) {
    it(`convolves two images at once in WebAssembly to the bit of one at a time, for ${name}`, () => {
      // Each lane of the paired passes repeats the JavaScript pass for its image, so the two
      // paths must agree exactly; the one-at-a-time path is checked against the definition above.
      const factors = separablePsf(kernel, 1e-12);
      const convolver = new PixelSubsetConvolver(columns, rows, kernel, outputs, factors);
      expect(convolver.hasPairs).toBe(true);
      const second = Float64Array.from(input, (v, p) => Math.cos(0.11 * p) - 0.5 * v);
      const single = [input, second].map((image) => {
        for (let p = 0; p < image.length; p++) convolver.input[convolver.paddedIndex(p)] = image[p];
        const output = new Float64Array(columns * rows).fill(Number.NaN);
        convolver.convolve(output, 0);
        return output;
      });
      for (let p = 0; p < input.length; p++) {
        const q = convolver.paddedIndex(p);
        convolver.pairInput[2 * q] = input[p];
        convolver.pairInput[2 * q + 1] = second[p];
      }
      const paired = new Float64Array(2 * columns * rows).fill(Number.NaN);
      // The compact copy: output pixel e of image l at compact[l * outputs.length + e].
      const compact = new Float64Array(2 * outputs.length).fill(Number.NaN);
      convolver.convolvePair(paired, 0, columns * rows, compact, 0, outputs.length);
      expect(paired.subarray(0, columns * rows)).toEqual(single[0]);
      expect(paired.subarray(columns * rows)).toEqual(single[1]);
      expect(Array.from(compact)).toEqual([...Array.from(outputs, (p) => single[0][p]), ...Array.from(outputs, (p) => single[1][p])]);
      const one = new Float64Array(outputs.length + 3).fill(Number.NaN);
      convolver.convolve(new Float64Array(columns * rows), 0, one, 3);
      expect(Array.from(one.subarray(3))).toEqual(Array.from(outputs, (p) => single[1][p]));
    });
  }
});
