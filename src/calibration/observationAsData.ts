import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { sharedFloat64Array, sharedInt32Array, sharedUint8Array, type ObservedData } from '../data/index.js';
import { gridOfObservation, maskOfObservation, psfOfObservation } from '../model/observationSetup.js';

/**
 * The config's observation as an (empty) data set: its grid, mask and PSF, with zero image and
 * unit noise. What a prior transform needs before any data exist (a position prior uniform over
 * the mask maps the unit square onto the used pixels of this mask, the same mask `simulate`
 * writes).
 */
export function observationAsData(config: ArcsiftConfig): ObservedData {
  const grid = gridOfObservation(config.observation);
  const count = grid.columns * grid.rows;
  const mask = sharedUint8Array(count);
  mask.set(maskOfObservation(config.observation.mask, grid));
  const usedList: number[] = [];
  for (let i = 0; i < count; i++) if (mask[i] === 1) usedList.push(i);
  const usedPixels = sharedInt32Array(usedList.length);
  usedPixels.set(usedList);
  const noise = sharedFloat64Array(count);
  noise.fill(1);
  const psf = psfOfObservation(config.observation, config.file);
  return {
    files: { image: `(the observation of ${config.file})`, noise: '(unit noise)', psf: '(the config\'s PSF)' },
    columns: grid.columns, rows: grid.rows, pixelScaleArcsec: grid.pixelScaleArcsec,
    image: sharedFloat64Array(count), noise, psf, mask, usedPixels, notices: [],
  };
}
