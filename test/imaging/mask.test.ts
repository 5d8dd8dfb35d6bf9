import { describe, expect, it } from 'vitest';
import { allPixelsMask, annulusMask, discMask, maskFromImage, usedPixelIndices } from '../../src/imaging/mask.js';
import { pixelGrid } from '../../src/imaging/pixelGrid.js';
import { InputError } from '../../src/errors.js';

const grid = pixelGrid(5, 5, 1); // pixel centres at -2..2 in both axes

describe('masks', () => {
  it('annulus 1 <= r <= 2 on a 5 x 5 grid keeps the 12 hand-counted pixels', () => {
    // r^2 = 1 (4 pixels), 2 (4), 4 (4) are inside; 0 (centre), 5 and 8 are outside.
    const mask = annulusMask(grid, 1, 2);
    expect(Array.from(mask)).toEqual([
      0, 0, 1, 0, 0,
      0, 1, 1, 1, 0,
      1, 1, 0, 1, 1,
      0, 1, 1, 1, 0,
      0, 0, 1, 0, 0,
    ]);
    expect(usedPixelIndices(mask).length).toBe(12);
  });

  it('disc of radius 1.5 centred off-origin (hand-computed)', () => {
    // Centre (1, -1) = pixel (3, 1): keeps its 3 x 3 neighbourhood (r^2 <= 2 < 2.25).
    const mask = discMask(grid, 1.5, 1, -1);
    expect(Array.from(usedPixelIndices(mask))).toEqual([2, 3, 4, 7, 8, 9, 12, 13, 14]);
  });

  it('all pixels, and from an image (non-zero = used)', () => {
    expect(usedPixelIndices(allPixelsMask(grid)).length).toBe(25);
    const image = new Float64Array(25);
    image[6] = 1;
    image[24] = -0.5;
    expect(Array.from(usedPixelIndices(maskFromImage(image, grid)))).toEqual([6, 24]);
  });

  it('refuses bad input with InputError naming what is wrong', () => {
    expect(() => annulusMask(grid, 2, 1)).toThrow(InputError);
    expect(() => maskFromImage(new Float64Array(24), grid, 'mask.fits')).toThrow(/mask\.fits.*25 pixels/);
    const image = new Float64Array(25);
    image[7] = Number.NaN;
    expect(() => maskFromImage(image, grid, 'mask.fits')).toThrow(/pixel \(2, 1\)/);
  });
});
