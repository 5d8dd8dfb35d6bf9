import { InputError, expectedFound } from '../errors.js';
import { checkKernelSize, normaliseInPlace, type PsfKernel, type PsfSampling } from './psfKernel.js';

/** Moffat 1969 (A&A 3, 455): FWHM = 2 alpha sqrt(2^(1/beta) - 1), so alpha from the FWHM. */
export function moffatAlpha(fwhmArcsec: number, beta: number): number {
  return fwhmArcsec / (2 * Math.sqrt(Math.pow(2, 1 / beta) - 1));
}

/** Flux fraction the default kernel may leave outside its circle: 1e-3. */
export const MOFFAT_PSF_OUTSIDE_FRACTION = 1e-3;
/** Cap on the default half-width, in FWHM (matters only for beta close to 1). */
export const MOFFAT_PSF_MAX_HALF_WIDTH_FWHM = 10;

/**
 * Circular Moffat PSF I(r) = [1 + (r / alpha)^2]^(-beta) (Moffat 1969), beta > 1. With
 * 'pixelIntegrated' (default) integrated over each pixel by the midpoint rule on subsampling x
 * subsampling sub-pixels; with 'pixelCentre' sampled at the pixel centres (see PsfSampling;
 * subsampling is then not used). Normalised to sum 1 after truncation. Default size: odd,
 * half-width the radius outside which a fraction (1 + r^2/alpha^2)^(1 - beta) = 1e-3 of the
 * flux lies (the closed-form enclosed flux of the Moffat profile), at most 10 FWHM.
 */
export function moffatPsfKernel(
  fwhmArcsec: number, beta: number, pixelScaleArcsec: number, sizePixels?: number, subsampling = 11,
  sampling: PsfSampling = 'pixelIntegrated',
): PsfKernel {
  if (!(fwhmArcsec > 0) || !Number.isFinite(fwhmArcsec)) {
    throw new InputError(expectedFound('a FWHM in arcsec > 0', fwhmArcsec), { key: 'psf.fwhmArcsec' });
  }
  if (!(beta > 1) || !Number.isFinite(beta)) {
    throw new InputError(expectedFound('a Moffat beta > 1 (finite total flux)', beta), { key: 'psf.beta' });
  }
  if (!Number.isInteger(subsampling) || subsampling < 1) {
    throw new InputError(expectedFound('a whole number >= 1', subsampling), { key: 'psf.subsampling' });
  }
  const alpha = moffatAlpha(fwhmArcsec, beta);
  let size: number;
  if (sizePixels === undefined) {
    const radius = alpha * Math.sqrt(Math.pow(MOFFAT_PSF_OUTSIDE_FRACTION, 1 / (1 - beta)) - 1);
    const halfWidth = Math.min(radius, MOFFAT_PSF_MAX_HALF_WIDTH_FWHM * fwhmArcsec);
    size = 2 * Math.ceil(halfWidth / pixelScaleArcsec) + 1;
  } else {
    size = checkKernelSize(sizePixels, 'psf.sizePixels');
  }
  const centre = (size - 1) / 2;
  if (sampling === 'pixelCentre') subsampling = 1;
  const subStep = pixelScaleArcsec / subsampling;
  const firstOffset = -((subsampling - 1) / 2) * subStep;
  const inverseAlpha2 = 1 / (alpha * alpha);
  const values = new Float64Array(size * size);
  for (let b = 0; b < size; b++) {
    const y0 = (b - centre) * pixelScaleArcsec + firstOffset;
    for (let a = 0; a < size; a++) {
      const x0 = (a - centre) * pixelScaleArcsec + firstOffset;
      let sum = 0;
      for (let v = 0; v < subsampling; v++) {
        const y = y0 + v * subStep;
        for (let u = 0; u < subsampling; u++) {
          const x = x0 + u * subStep;
          sum += Math.pow(1 + (x * x + y * y) * inverseAlpha2, -beta);
        }
      }
      values[b * size + a] = sum;
    }
  }
  normaliseInPlace(values);
  return { columns: size, rows: size, values };
}
