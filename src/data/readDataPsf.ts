import { InputError, pixelText } from '../errors.js';
import type { FitsLocator } from '../fits/index.js';
import { pixelCentrePsf } from '../imaging/pixelCentrePsf.js';
import { checkPsfKernel, type PsfKernel } from '../imaging/psfKernel.js';
import { requireMatchingSteps } from './dataPixelScale.js';
import { readDataImage } from './readDataImage.js';
import { sharedFloat64Array } from './sharedArrays.js';

/** A PSF from the data, on the image's pixels, and the finer one it came from when there was one. */
export interface DataPsf {
  /** On the image's pixel scale, odd-sized, summing to 1. */
  readonly kernel: PsfKernel;
  /** The PSF as the file holds it, `factor` cells per image pixel along each axis, summing to 1. */
  readonly oversampled?: { readonly factor: number; readonly kernel: PsfKernel };
}

/**
 * How far from 1 a PSF's sum may be before the user is told of its renormalisation (it is always
 * divided by its sum). A kernel of n cells stored as 32-bit floats and normalised in single
 * precision sums to 1 within about n x 6e-8 (each value rounded by up to 2^-24 relative), so a
 * 1000 x 1000 kernel may miss by 1e-4 through rounding alone; and a change of that size scales the
 * fitted amplitudes by as little, far below any flux calibration. A larger miss says something of
 * the file (a PSF normalised to its peak, or cut short) worth a line.
 */
export const PSF_SUM_NOTICE_TOLERANCE = 1e-4;

/**
 * How far (relative) PIXELSCL times the oversampling may differ from the image's pixel scale.
 * PSF files state the detector's nominal scale, which a resampled image may share only to a few
 * digits; 1e-3 changes the PSF's width by 0.1%, while a PSF made for another pixel scale (0.031"
 * against 0.03") is caught.
 */
export const PSF_PIXELSCL_TOLERANCE = 1e-3;

function wholeFactor(value: number, what: string, place: { file: string; key?: string }): number {
  if (!Number.isInteger(value) || value < 1) throw new InputError(`PSF oversampling (${what}): expected a whole number >= 1, found ${value}`, place);
  return value;
}

function shared(kernel: PsfKernel): PsfKernel {
  const values = sharedFloat64Array(kernel.values.length);
  values.set(kernel.values);
  return { columns: kernel.columns, rows: kernel.rows, values };
}

/** The cell of the largest value; it must lie within half an image pixel of the middle cell. */
function requireCentred(kernel: PsfKernel, factor: number, file: string): void {
  let peak = 0;
  for (let k = 1; k < kernel.values.length; k++) if (kernel.values[k] > kernel.values[peak]) peak = k;
  const column = peak % kernel.columns;
  const row = Math.floor(peak / kernel.columns);
  const middle = [(kernel.columns - 1) / 2, (kernel.rows - 1) / 2];
  const reach = Math.floor(factor / 2);
  if (Math.abs(column - middle[0]) > reach || Math.abs(row - middle[1]) > reach) {
    throw new InputError(
      `PSF not centred: expected its peak within ${reach} cells (half an image pixel) of the middle cell (${middle[0]}, ${middle[1]}), found it at ${pixelText(column, row)}`,
      { file },
    );
  }
}

/**
 * Reads the PSF of a data set. The oversampling is `explicitFactor` or the header's OVERSAMP
 * (they must agree), else 1. The file's pixel scale, where its header states one (CDELT/CD, or
 * PIXELSCL in arcsec per cell), must be the image's divided by the oversampling. An oversampled
 * PSF must be centred on its middle cell; it is normalised, kept, and sampled at the image's
 * pixel centres (pixelCentrePsf) for the kernel the forward model uses: that model averages the
 * light over each pixel before the PSF, as with the analytic PSFs (psfOfObservation). The kept
 * fine PSF is there for a forward model on a sub-pixel grid. Notices say what was done;
 * mistakes throw InputError naming the file (with its HDU) and keyword.
 */
export function readDataPsf(locator: FitsLocator, imageScaleArcsec: number, explicitFactor: number | undefined, notices: string[]): DataPsf {
  const file = locator.text;
  const image = readDataImage(locator, 'psf');
  const stated = image.header.getNumber('OVERSAMP');
  const headerFactor = stated === undefined ? undefined : wholeFactor(stated, 'OVERSAMP in the header', { file, key: 'OVERSAMP' });
  if (explicitFactor !== undefined) wholeFactor(explicitFactor, 'as given', { file });
  if (explicitFactor !== undefined && headerFactor !== undefined && explicitFactor !== headerFactor) {
    throw new InputError(`PSF oversampling disagrees: given as ${explicitFactor}, found OVERSAMP = ${headerFactor} in the header`, { file, key: 'OVERSAMP' });
  }
  const factor = explicitFactor ?? headerFactor ?? 1;
  const hint = factor === 1 ? '; if the PSF is sampled N times finer than the image, say so (OVERSAMP = N in its header, or --psf-oversampling N)' : '';
  const expectedFrom = factor === 1 ? 'the image' : `the image's pixel scale divided by the oversampling ${factor}`;
  try {
    requireMatchingSteps({ role: 'psf', path: file, image }, imageScaleArcsec / factor, expectedFrom);
  } catch (error) {
    if (error instanceof InputError) throw new InputError(`${error.bareMessage}${hint}`, error.place);
    throw error;
  }
  const pixelscl = image.header.getNumber('PIXELSCL');
  if (pixelscl !== undefined && !(Math.abs(pixelscl * factor - imageScaleArcsec) <= PSF_PIXELSCL_TOLERANCE * imageScaleArcsec)) {
    throw new InputError(
      `PSF cell size disagrees with the image: expected PIXELSCL = ${imageScaleArcsec / factor} arcsec (${expectedFrom}) within ${PSF_PIXELSCL_TOLERANCE} relative, found ${pixelscl}${hint}`,
      { file, key: 'PIXELSCL' },
    );
  }
  const checked = checkPsfKernel(image.data, image.nx, image.ny, { file });
  if (Math.abs(checked.inputSum - 1) > PSF_SUM_NOTICE_TOLERANCE) {
    notices.push(`${file}: the PSF summed to ${checked.inputSum}, not 1; it was divided by that sum`);
  }
  if (factor === 1) return { kernel: shared(checked.kernel) };
  requireCentred(checked.kernel, factor, file);
  const kernel = pixelCentrePsf(checked.kernel, factor);
  notices.push(
    `${file}: the PSF is sampled ${factor} times finer than the image (${explicitFactor !== undefined ? 'as given' : 'OVERSAMP in its header'}); ` +
      `its cells at the image's pixel centres make a ${kernel.columns} x ${kernel.rows} kernel (the forward model averages light over each pixel first), and the ${image.nx} x ${image.ny} one is kept`,
  );
  return { kernel: shared(kernel), oversampled: { factor, kernel: shared(checked.kernel) } };
}
