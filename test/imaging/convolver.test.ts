import { describe, expect, it } from 'vitest';
import uniform from '@stdlib/random/base/uniform';
import { FftConvolver, createConvolver, nextPowerOfTwo } from '../../src/imaging/convolver.js';
import { DirectConvolver, directConvolution } from '../../src/imaging/directConvolution.js';
import { gaussianPsfKernel } from '../../src/imaging/gaussianPsf.js';
import type { PsfKernel } from '../../src/imaging/psfKernel.js';

function randomArray(length: number, seed: number): Float64Array {
  const draw = uniform.factory(-1, 1, { seed });
  return Float64Array.from({ length }, () => draw());
}

function randomKernel(columns: number, rows: number, seed: number): PsfKernel {
  // Not symmetric, so a mirrored (correlation instead of convolution) path would fail.
  const values = randomArray(columns * rows, seed).map((v) => v + 1.2);
  const sum = values.reduce((a, b) => a + b, 0);
  return { columns, rows, values: values.map((v) => v / sum) };
}

function maxAbs(values: Float64Array): number {
  let m = 0;
  for (const v of values) m = Math.max(m, Math.abs(v));
  return m;
}

describe('direct convolution (the reference)', () => {
  it('maps a point source to an unmirrored copy of the kernel centred on it (hand-computed)', () => {
    // 3 x 3 kernel with distinct values; a unit point at pixel (2, 1) of a 5 x 4 image must give
    // output(2 + a - 1, 1 + b - 1) = K(a, b) (convolution: a point spreads into the kernel).
    const kernel: PsfKernel = { columns: 3, rows: 3, values: Float64Array.of(1, 2, 3, 4, 5, 6, 7, 8, 9) };
    const input = new Float64Array(20);
    input[1 * 5 + 2] = 1;
    const output = new Float64Array(20);
    directConvolution(input, 5, 4, kernel, output);
    const expected = new Float64Array(20);
    for (let b = 0; b < 3; b++) for (let a = 0; a < 3; a++) expected[(b) * 5 + (1 + a)] = kernel.values[b * 3 + a];
    expect(Array.from(output)).toEqual(Array.from(expected));
  });

  it('drops what falls outside the image (zero boundary, hand-computed corner)', () => {
    const kernel: PsfKernel = { columns: 3, rows: 3, values: Float64Array.of(1, 2, 3, 4, 5, 6, 7, 8, 9) };
    const input = new Float64Array(9);
    input[0] = 1; // pixel (0, 0): only kernel elements with a, b >= 1 land inside
    const output = new Float64Array(9);
    new DirectConvolver(3, 3, kernel).convolve(input, output);
    expect(Array.from(output)).toEqual([5, 6, 0, 8, 9, 0, 0, 0, 0]);
  });
});

describe('FFT convolution', () => {
  // Against direct convolution. Double-precision FFT round-off grows like eps log2(N) times the
  // data scale (~1e-15 here); 1e-10 of the image scale leaves room and still catches any
  // misplaced, mirrored or wrapped-around term, which is of the order of the data itself.
  const cases: Array<[number, number, number, number]> = [
    [40, 40, 3, 3], [40, 40, 11, 11], [40, 40, 21, 21],
    [37, 23, 11, 11], [23, 50, 21, 21], [64, 17, 3, 3], [31, 31, 5, 9], [1, 13, 1, 5], [6, 5, 11, 11],
  ];
  for (const [columns, rows, kernelColumns, kernelRows] of cases) {
    it(`equals direct convolution: ${columns} x ${rows} image, ${kernelColumns} x ${kernelRows} kernel`, () => {
      const input = randomArray(columns * rows, 7 + columns * rows);
      const kernel = randomKernel(kernelColumns, kernelRows, 11 + kernelColumns);
      const reference = new Float64Array(columns * rows);
      directConvolution(input, columns, rows, kernel, reference);
      const convolver = new FftConvolver(columns, rows, kernel);
      expect(convolver.paddedColumns).toBeGreaterThanOrEqual(columns + kernelColumns - 1);
      expect(convolver.paddedRows).toBeGreaterThanOrEqual(rows + kernelRows - 1);
      const output = new Float64Array(columns * rows).fill(Number.NaN);
      convolver.convolve(input, output);
      const difference = output.map((v, k) => v - reference[k]);
      expect(maxAbs(difference)).toBeLessThan(1e-10 * maxAbs(input));
      // Reusing the convolver (buffers are reused) gives the same answer for new data.
      const second = randomArray(columns * rows, 99);
      directConvolution(second, columns, rows, kernel, reference);
      convolver.convolve(second, output);
      expect(maxAbs(output.map((v, k) => v - reference[k]))).toBeLessThan(1e-10 * maxAbs(second));
    });
  }

  it('conserves flux for a source well inside the image', () => {
    // Gaussian blob of sigma 2 pixels at the centre of 100 x 100, kernel 21 x 21 summing to 1:
    // nothing reaches the edges, so the output sums to the input sum (to round-off).
    const columns = 100;
    const rows = 100;
    const input = new Float64Array(columns * rows);
    for (let j = 0; j < rows; j++) {
      for (let i = 0; i < columns; i++) input[j * columns + i] = Math.exp(-((i - 49.3) ** 2 + (j - 50.6) ** 2) / 8);
    }
    const kernel = gaussianPsfKernel(0.3, 0.05, 21);
    const output = new Float64Array(columns * rows);
    new FftConvolver(columns, rows, kernel).convolve(input, output);
    const sumIn = input.reduce((a, b) => a + b, 0);
    const sumOut = output.reduce((a, b) => a + b, 0);
    expect(Math.abs(sumOut / sumIn - 1)).toBeLessThan(1e-12);
  });

  it('createConvolver picks direct for tiny kernels, FFT otherwise, with the same result', () => {
    const input = randomArray(100 * 100, 5);
    const small = randomKernel(3, 3, 1);
    const large = randomKernel(21, 21, 2);
    expect(createConvolver(100, 100, small)).toBeInstanceOf(DirectConvolver);
    expect(createConvolver(100, 100, large)).toBeInstanceOf(FftConvolver);
    for (const kernel of [small, large]) {
      const reference = new Float64Array(100 * 100);
      directConvolution(input, 100, 100, kernel, reference);
      const output = new Float64Array(100 * 100);
      createConvolver(100, 100, kernel).convolve(input, output);
      expect(maxAbs(output.map((v, k) => v - reference[k]))).toBeLessThan(1e-10);
    }
  });

  it('pads to powers of two', () => {
    expect([1, 2, 3, 64, 65, 120].map(nextPowerOfTwo)).toEqual([2, 2, 4, 64, 128, 128]);
  });
});
