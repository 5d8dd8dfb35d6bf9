import { InputError } from '../errors.js';
import { checkPsfKernel } from '../imaging/psfKernel.js';
import { resolveDataFiles, type ObservedDataSource } from './dataFiles.js';
import { dataMaskFromValues, fullDataMask } from './dataMask.js';
import { dataPixelScaleArcsec, type DataImage } from './dataPixelScale.js';
import { maskedPixelValues } from './maskedPixelValues.js';
import type { ObservedData } from './observedData.js';
import { readDataImage } from './readDataImage.js';
import { sharedFloat64Array } from './sharedArrays.js';

/** What the data must match, usually the config's observation section. */
export interface ObservedDataExpectation {
  readonly columns?: number;
  readonly rows?: number;
  readonly pixelScaleArcsec?: number;
  /** Where these values come from, for messages. Default "the config's observation". */
  readonly from?: string;
}

function requireShape(data: DataImage, columns: number, rows: number, expectedFrom: string): void {
  const { nx, ny } = data.image;
  if (nx === columns && ny === rows) return;
  throw new InputError(
    `${data.role} shape: expected ${columns} x ${rows} pixels (columns x rows, NAXIS1 x NAXIS2) as ${expectedFrom}, found ${nx} x ${ny}`,
    { file: data.path, key: nx !== columns ? 'NAXIS1' : 'NAXIS2' },
  );
}

/**
 * Reads and checks an observed data set before any fitting starts: image, noise, PSF and
 * optional mask (absent: every pixel used, with a notice). Checks, in order: the files exist
 * and hold 2-D FITS images; image, noise and mask have one shape, equal to `expected`'s columns
 * and rows when given; the pixel scale (see dataPixelScaleArcsec); the PSF is odd-sized and
 * finite (renormalised with a notice when its sum is not 1); mask values are 0 or 1 with at
 * least one 1; image and noise are finite and the noise positive inside the mask. Every failure
 * is an InputError naming the file and, for one pixel, the pixel (column, row).
 */
export function loadObservedData(source: ObservedDataSource, expected: ObservedDataExpectation = {}): ObservedData {
  const files = resolveDataFiles(source);
  const notices: string[] = [];
  const image: DataImage = { role: 'image', path: files.image, image: readDataImage(files.image, 'image') };
  const noise: DataImage = { role: 'noise', path: files.noise, image: readDataImage(files.noise, 'noise') };
  const psf: DataImage = { role: 'psf', path: files.psf, image: readDataImage(files.psf, 'psf') };
  const mask: DataImage | undefined = files.mask === undefined
    ? undefined
    : { role: 'mask', path: files.mask, image: readDataImage(files.mask, 'mask') };

  const expectedFrom = expected.from ?? "the config's observation";
  const { nx: columns, ny: rows } = image.image;
  if (expected.columns !== undefined || expected.rows !== undefined) {
    requireShape(image, expected.columns ?? columns, expected.rows ?? rows, `${expectedFrom} gives`);
  }
  const imageFrom = `the image ${files.image} has`;
  requireShape(noise, columns, rows, imageFrom);
  if (mask !== undefined) requireShape(mask, columns, rows, imageFrom);

  const others = mask === undefined ? [noise, psf] : [noise, mask, psf];
  const pixelScaleArcsec = dataPixelScaleArcsec(image, others, expected.pixelScaleArcsec, expectedFrom, notices);

  const checkedPsf = checkPsfKernel(psf.image.data, psf.image.nx, psf.image.ny, { file: files.psf });
  if (checkedPsf.renormalised) {
    notices.push(`${files.psf}: the PSF summed to ${checkedPsf.inputSum}, not 1; it was divided by that sum`);
  }
  const psfValues = sharedFloat64Array(checkedPsf.kernel.values.length);
  psfValues.set(checkedPsf.kernel.values);

  const used = mask === undefined ? fullDataMask(columns * rows) : dataMaskFromValues(mask.image.data, columns, files.mask as string);
  if (mask === undefined) notices.push(`no mask file given or found${source.folder === undefined ? '' : ` in ${source.folder}`}: every pixel is used`);

  const imageValues = maskedPixelValues(image.image.data, used.mask, columns, 0, false, files.image, 'image value');
  const noiseValues = maskedPixelValues(noise.image.data, used.mask, columns, 1, true, files.noise, 'noise value (1-sigma)');
  for (const [values, path, replacement] of [[imageValues, files.image, 0], [noiseValues, files.noise, 1]] as const) {
    if (values.nonFiniteOutside > 0) {
      notices.push(`${path}: ${values.nonFiniteOutside} pixels outside the mask hold NaN or infinite values; they are not used (set to ${replacement})`);
    }
  }

  return {
    files,
    columns,
    rows,
    pixelScaleArcsec,
    image: imageValues.values,
    noise: noiseValues.values,
    psf: { columns: checkedPsf.kernel.columns, rows: checkedPsf.kernel.rows, values: psfValues },
    mask: used.mask,
    usedPixels: used.usedPixels,
    notices,
  };
}
