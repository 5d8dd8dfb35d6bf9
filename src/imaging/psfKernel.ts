import { InputError, expectedFound, type InputErrorPlace } from '../errors.js';

/**
 * A PSF as an odd-sized pixel array on the image's pixel scale, row-major (element (a, b) at
 * b * columns + a), centred on element ((columns - 1) / 2, (rows - 1) / 2), summing to 1.
 */
export interface PsfKernel {
  readonly columns: number;
  readonly rows: number;
  readonly values: Float64Array;
}

/**
 * How an analytic PSF becomes pixel values. 'pixelCentre': the PSF sampled at the pixel centres
 * (then normalised), the right kernel for an image that is already the mean of the light over
 * each pixel, as arcsift's forward model makes (the pixel box must not be applied twice).
 * 'pixelIntegrated': the PSF integrated over each pixel, the kernel for point sources or
 * images sampled at pixel centres.
 */
export type PsfSampling = 'pixelCentre' | 'pixelIntegrated';

export interface CheckedPsfKernel {
  readonly kernel: PsfKernel;
  /** True when the input did not sum to 1 (within 1e-9) and was divided by its sum. */
  readonly renormalised: boolean;
  /** The sum of the input values. */
  readonly inputSum: number;
}

/** How far from 1 a kernel's sum may be before it is renormalised (and the caller told). */
export const PSF_SUM_TOLERANCE = 1e-9;

/**
 * Checks a user-supplied kernel (odd size in both axes, finite values, positive sum) and returns
 * a normalised copy. Mistakes throw InputError naming `place` (e.g. the file) and the pixel.
 */
export function checkPsfKernel(
  values: ArrayLike<number>, columns: number, rows: number, place: InputErrorPlace = {},
): CheckedPsfKernel {
  for (const [axis, size] of [['columns', columns], ['rows', rows]] as const) {
    if (!Number.isInteger(size) || size < 1 || size % 2 === 0) {
      throw new InputError(`PSF kernel ${axis}: ${expectedFound('an odd whole number (the PSF centre is one pixel)', size)}`, place);
    }
  }
  if (values.length !== columns * rows) {
    throw new InputError(
      `PSF kernel: ${expectedFound(`${columns} x ${rows} = ${columns * rows} values`, values.length)}`, place,
    );
  }
  let sum = 0;
  for (let k = 0; k < values.length; k++) {
    const value = values[k];
    if (!Number.isFinite(value)) {
      const pixel = [k % columns, Math.floor(k / columns)] as const;
      throw new InputError(`PSF kernel: ${expectedFound('a finite value', value)}`, { ...place, pixel });
    }
    sum += value;
  }
  if (!(sum > 0)) {
    throw new InputError(`PSF kernel: ${expectedFound('values with a positive sum', sum)}`, place);
  }
  const copy = Float64Array.from(values);
  const renormalised = Math.abs(sum - 1) > PSF_SUM_TOLERANCE;
  if (renormalised) normaliseInPlace(copy, sum);
  return { kernel: { columns, rows, values: copy }, renormalised, inputSum: sum };
}

/** Divides every value by `sum` (default: the values' own sum). */
export function normaliseInPlace(values: Float64Array, sum = sumOf(values)): void {
  const inverse = 1 / sum;
  for (let k = 0; k < values.length; k++) values[k] *= inverse;
}

function sumOf(values: Float64Array): number {
  let sum = 0;
  for (let k = 0; k < values.length; k++) sum += values[k];
  return sum;
}

/** Validates a kernel size given in pixels: an odd whole number >= 1. */
export function checkKernelSize(sizePixels: number, key: string): number {
  if (!Number.isInteger(sizePixels) || sizePixels < 1 || sizePixels % 2 === 0) {
    throw new InputError(expectedFound('an odd whole number of pixels', sizePixels), { key });
  }
  return sizePixels;
}
