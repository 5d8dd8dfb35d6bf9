import { erf } from '../numeric/special/stdlibSpecial.js';
import { InputError, expectedFound } from '../errors.js';
import { checkKernelSize, normaliseInPlace, type PsfKernel, type PsfSampling } from './psfKernel.js';

/** FWHM = 2 sqrt(2 ln 2) sigma for a Gaussian (common practice). */
export const GAUSSIAN_FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/** Default half-width of the kernel in FWHM: 2.5 FWHM = 5.9 sigma, leaving < 1e-7 of the flux out. */
export const GAUSSIAN_PSF_HALF_WIDTH_FWHM = 2.5;

/**
 * Circular Gaussian PSF, separable into two 1-D factors. 'pixelIntegrated' (default): integrated
 * exactly over each pixel, the integral of a 1-D Gaussian over [x - s/2, x + s/2] being
 * (erf((x + s/2) / (sigma sqrt 2)) - erf((x - s/2) / (sigma sqrt 2))) / 2 (Abramowitz & Stegun
 * 1964, 7.1.1). 'pixelCentre': exp(-x^2 / (2 sigma^2)) at the pixel centres (see PsfSampling).
 * Normalised to sum 1 after truncation to sizePixels x sizePixels (default: odd, half-width
 * 2.5 FWHM).
 */
export function gaussianPsfKernel(
  fwhmArcsec: number, pixelScaleArcsec: number, sizePixels?: number, sampling: PsfSampling = 'pixelIntegrated',
): PsfKernel {
  if (!(fwhmArcsec > 0) || !Number.isFinite(fwhmArcsec)) {
    throw new InputError(expectedFound('a FWHM in arcsec > 0', fwhmArcsec), { key: 'psf.fwhmArcsec' });
  }
  const size = sizePixels === undefined
    ? 2 * Math.ceil((GAUSSIAN_PSF_HALF_WIDTH_FWHM * fwhmArcsec) / pixelScaleArcsec) + 1
    : checkKernelSize(sizePixels, 'psf.sizePixels');
  const sigma = fwhmArcsec / GAUSSIAN_FWHM_PER_SIGMA;
  const scale = 1 / (sigma * Math.SQRT2);
  const centre = (size - 1) / 2;
  const alongAxis = new Float64Array(size);
  for (let a = 0; a < size; a++) {
    const x = (a - centre) * pixelScaleArcsec;
    alongAxis[a] = sampling === 'pixelCentre'
      ? Math.exp(-(x * scale) * (x * scale))
      : 0.5 * (erf((x + 0.5 * pixelScaleArcsec) * scale) - erf((x - 0.5 * pixelScaleArcsec) * scale));
  }
  const values = new Float64Array(size * size);
  for (let b = 0; b < size; b++) {
    for (let a = 0; a < size; a++) values[b * size + a] = alongAxis[a] * alongAxis[b];
  }
  normaliseInPlace(values);
  return { columns: size, rows: size, values };
}
