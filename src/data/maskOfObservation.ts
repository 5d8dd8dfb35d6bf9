import type { MaskConfig } from '../config/arcsiftConfig.js';
import { InputError } from '../errors.js';
import { allPixelsMask, annulusMask, discMask } from '../imaging/mask.js';
import type { PixelGrid } from '../imaging/pixelGrid.js';

/** The config's mask in words, for notices: e.g. `annulus 0.5" to 1.7" about (0", 0")`. */
export function describeMaskConfig(mask: MaskConfig | undefined): string {
  if (mask === undefined || mask.shape === 'all') return 'every pixel';
  const about = `about (${mask.centerXArcsec}", ${mask.centerYArcsec}")`;
  return mask.shape === 'disc'
    ? `disc of radius ${mask.outerRadiusArcsec}" ${about}`
    : `annulus ${mask.innerRadiusArcsec}" to ${mask.outerRadiusArcsec}" ${about}`;
}

/** The mask (1 = pixel used) a mask config describes on a grid; no mask config means every pixel. */
export function maskOfObservation(mask: MaskConfig | undefined, grid: PixelGrid): Uint8Array {
  const out = mask === undefined || mask.shape === 'all'
    ? allPixelsMask(grid)
    : mask.shape === 'disc'
      ? discMask(grid, mask.outerRadiusArcsec, mask.centerXArcsec, mask.centerYArcsec)
      : annulusMask(grid, mask.innerRadiusArcsec, mask.outerRadiusArcsec, mask.centerXArcsec, mask.centerYArcsec);
  if (!out.includes(1)) throw new InputError('the mask leaves no pixel in use', { key: 'observation.mask' });
  return out;
}
