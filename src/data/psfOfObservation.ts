import type { ObservationConfig } from '../config/arcsiftConfig.js';
import { InputError } from '../errors.js';
import { readFitsImage } from '../fits/index.js';
import { gaussianPsfKernel } from '../imaging/gaussianPsf.js';
import { moffatPsfKernel } from '../imaging/moffatPsf.js';
import { checkPsfKernel, type PsfKernel } from '../imaging/psfKernel.js';
import { dirname, resolve } from 'node:path';

/** The config's PSF in words, for notices: e.g. `gaussian, FWHM 0.18"`. */
export function describePsfConfig(observation: ObservationConfig): string {
  const psf = observation.psf;
  if (psf === undefined) return 'none';
  if (psf.shape === 'file') return `the file ${psf.path}`;
  return psf.shape === 'gaussian' ? `gaussian, FWHM ${psf.fwhmArcsec}"` : `moffat, FWHM ${psf.fwhmArcsec}", beta ${psf.moffatBeta}`;
}

/**
 * The PSF kernel an observation config describes; a file path is relative to the config.
 * The forward model averages the light over each pixel before the PSF, so an analytic PSF is
 * sampled at the pixel centres ('pixelCentre'): integrating it over the pixel as well would
 * apply the pixel box twice (the effective PSF variance too large by pixel^2 / 12). A PSF read
 * from a FITS file is used as given and taken to be sampled at pixel centres in the same sense.
 * Throws InputError naming the config when it gives no PSF.
 */
export function psfOfObservation(observation: ObservationConfig, configFile: string): PsfKernel {
  const psf = observation.psf;
  if (psf === undefined) {
    throw new InputError('no PSF: expected observation.psf (shape gaussian, moffat or file) in the config', { file: configFile, key: 'observation.psf' });
  }
  const scale = observation.pixelScaleArcsec;
  if (psf.shape === 'gaussian') return gaussianPsfKernel(psf.fwhmArcsec, scale, psf.sizePixels, 'pixelCentre');
  if (psf.shape === 'moffat') {
    return moffatPsfKernel(psf.fwhmArcsec, psf.moffatBeta, scale, psf.sizePixels, undefined, 'pixelCentre');
  }
  const path = resolve(dirname(configFile), psf.path);
  const image = readFitsImage(path);
  return checkPsfKernel(image.data, image.nx, image.ny, { file: path }).kernel;
}
