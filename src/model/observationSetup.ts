import type { MaskConfig, ObservationConfig } from '../config/arcsiftConfig.js';
import { InputError } from '../errors.js';
import { readFitsImage } from '../fits/index.js';
import { gaussianPsfKernel } from '../imaging/gaussianPsf.js';
import { moffatPsfKernel } from '../imaging/moffatPsf.js';
import { pixelGrid, type PixelGrid } from '../imaging/pixelGrid.js';
import { allPixelsMask, annulusMask, discMask } from '../imaging/mask.js';
import { checkPsfKernel, type PsfKernel } from '../imaging/psfKernel.js';
import { dirname, resolve } from 'node:path';

/** The pixel grid an observation config describes. */
export function gridOfObservation(observation: ObservationConfig): PixelGrid {
  return pixelGrid(observation.columns, observation.rows, observation.pixelScaleArcsec, 'observation');
}

/**
 * The PSF kernel an observation config describes; a file path is relative to the config.
 * The forward model averages the light over each pixel before the PSF, so an analytic PSF is
 * sampled at the pixel centres ('pixelCentre'): integrating it over the pixel as well would
 * apply the pixel box twice (the effective PSF variance too large by pixel^2 / 12). A PSF read
 * from a FITS file is used as given and taken to be sampled at pixel centres in the same sense.
 */
export function psfOfObservation(observation: ObservationConfig, configFile: string): PsfKernel {
  const psf = observation.psf;
  const scale = observation.pixelScaleArcsec;
  if (psf.shape === 'gaussian') return gaussianPsfKernel(psf.fwhmArcsec, scale, psf.sizePixels, 'pixelCentre');
  if (psf.shape === 'moffat') {
    return moffatPsfKernel(psf.fwhmArcsec, psf.moffatBeta, scale, psf.sizePixels, undefined, 'pixelCentre');
  }
  const path = resolve(dirname(configFile), psf.path);
  const image = readFitsImage(path);
  return checkPsfKernel(image.data, image.nx, image.ny, { file: path }).kernel;
}

/** The mask (1 = pixel used) a mask config describes on a grid. */
export function maskOfObservation(mask: MaskConfig, grid: PixelGrid): Uint8Array {
  const out = mask.shape === 'all'
    ? allPixelsMask(grid)
    : mask.shape === 'disc'
      ? discMask(grid, mask.outerRadiusArcsec, mask.centerXArcsec, mask.centerYArcsec)
      : annulusMask(grid, mask.innerRadiusArcsec, mask.outerRadiusArcsec, mask.centerXArcsec, mask.centerYArcsec);
  if (!out.includes(1)) throw new InputError('the mask leaves no pixel in use', { key: 'observation.mask' });
  return out;
}
