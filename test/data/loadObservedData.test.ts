import { execFileSync } from 'node:child_process';
import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { inputErrorOf } from '../support/inputErrorOf.js';
import { parse } from 'yaml';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';
import { writeFits } from '../../src/fits/index.js';
import { loadObservedData, PIXEL_SCALE_RELATIVE_TOLERANCE } from '../../src/data/index.js';
import {
  COLUMNS, PIXEL_SCALE_ARCSEC, ROWS, goodContent, goodImage, goodMask, goodNoise, goodPsf, makeRoot, scaleCards, withPixel,
  writeDataFolder,
} from './dataFolder.js';

// These tests check arcsift's own validation contract for observed data (what is refused, what
// is repaired, and what the messages name), which is common practice rather than a published
// result. Where a fact comes from outside the project, it is checked against astropy
// (Debian's python3-astropy): the (column, row) naming of pixels and the pixel scale from CDELT.

const PYTHON = '/usr/bin/python3';
const { root, remove } = makeRoot();
afterAll(remove);


describe('loading a good data folder (own validation contract, common practice)', () => {
  const folder = writeDataFolder(root);
  const data = loadObservedData({ folder }, { columns: COLUMNS, rows: ROWS, pixelScaleArcsec: PIXEL_SCALE_ARCSEC });
  const mask = goodMask();

  it('finds the default file names and returns the shape', () => {
    expect(data.files).toEqual({
      image: join(folder, 'image.fits'), noise: join(folder, 'noise.fits'), psf: join(folder, 'psf.fits'), mask: join(folder, 'mask.fits'),
    });
    expect([data.columns, data.rows]).toEqual([COLUMNS, ROWS]);
    expect(data.notices).toEqual([]);
  });

  it('takes the pixel scale from CDELT in degrees, as astropy.wcs does', () => {
    // Outside reference: astropy.wcs.utils.proj_plane_pixel_scales on the same header, x 3600 arcsec/deg.
    const script = [
      'import sys, astropy.wcs, astropy.wcs.utils, astropy.io.fits as f',
      'w = astropy.wcs.WCS(f.getheader(sys.argv[1]))',
      'print(repr(float(astropy.wcs.utils.proj_plane_pixel_scales(w)[0] * 3600)))',
    ].join('\n');
    const astropyArcsec = Number(execFileSync(PYTHON, ['-c', script, data.files.image], { encoding: 'utf8' }));
    // Both sides compute (0.05 / 3600) * 3600 in doubles: a few ulp apart at most.
    expect(Math.abs(data.pixelScaleArcsec - astropyArcsec)).toBeLessThan(1e-14);
    expect(Math.abs(data.pixelScaleArcsec - PIXEL_SCALE_ARCSEC)).toBeLessThan(1e-14);
  });

  it('returns the pixel values used, 0 image and 1 noise outside the mask', () => {
    const image = goodImage();
    const noise = goodNoise();
    expect(Array.from(data.image)).toEqual(Array.from(image, (v, k) => (mask[k] === 1 ? v : 0)));
    expect(Array.from(data.noise)).toEqual(Array.from(noise, (v, k) => (mask[k] === 1 ? v : 1)));
    expect(Array.from(data.mask)).toEqual(Array.from(mask));
  });

  it('lists the used pixels row-major', () => {
    // Hand count: column 0 of every row and pixel (4, 3) are out, so rows 0-2 use columns 1-4
    // and row 3 uses columns 1-3.
    const expected = [1, 2, 3, 4, 6, 7, 8, 9, 11, 12, 13, 14, 16, 17, 18];
    expect(Array.from(data.usedPixels)).toEqual(expected);
  });

  it('keeps the normalised PSF as it was', () => {
    expect([data.psf.columns, data.psf.rows]).toEqual([3, 3]);
    expect(Array.from(data.psf.values)).toEqual(Array.from(goodPsf()));
  });

  it('puts image, noise, mask, used pixels and PSF on SharedArrayBuffers', () => {
    for (const array of [data.image, data.noise, data.mask, data.usedPixels, data.psf.values]) {
      expect(array.buffer).toBeInstanceOf(SharedArrayBuffer);
    }
  });

  it('lets explicit paths override the folder names', () => {
    const other = writeDataFolder(root, { noise: { ...goodContent().noise, data: goodNoise().map((v) => 2 * v) } });
    const mixed = loadObservedData({ folder, noise: join(other, 'noise.fits') });
    expect(mixed.files.noise).toBe(join(other, 'noise.fits'));
    expect(mixed.noise[1]).toBe(2 * goodNoise()[1]);
    expect(mixed.files.image).toBe(join(folder, 'image.fits'));
  });

  it('loads from explicit paths alone, without a folder', () => {
    const alone = loadObservedData({ image: data.files.image, noise: data.files.noise, psf: data.files.psf });
    expect(alone.files.mask).toBeUndefined();
    expect(alone.usedPixels.length).toBe(COLUMNS * ROWS);
  });
});

describe('notices, not errors (own validation contract, common practice)', () => {
  it('uses every pixel when the folder has no mask.fits, and says so', () => {
    const folder = writeDataFolder(root, { mask: null });
    const data = loadObservedData({ folder });
    expect(data.files.mask).toBeUndefined();
    expect(Array.from(data.mask).every((v) => v === 1)).toBe(true);
    expect(Array.from(data.usedPixels)).toEqual(Array.from({ length: COLUMNS * ROWS }, (_, k) => k));
    expect(data.notices.join('\n')).toMatch(/no mask file.*every pixel is used/);
  });

  it('renormalises a PSF that does not sum to 1 and names the sum found', () => {
    const folder = writeDataFolder(root, { psf: { ...goodContent().psf, data: goodPsf().map((v) => 2 * v) } });
    const data = loadObservedData({ folder });
    const sum = data.psf.values.reduce((a, b) => a + b, 0);
    expect(sum).toBe(1); // multiples of 1/16: exact in binary
    expect(Array.from(data.psf.values)).toEqual(Array.from(goodPsf()));
    expect(data.notices).toHaveLength(1);
    expect(data.notices[0]).toContain(join(folder, 'psf.fits'));
    expect(data.notices[0]).toContain('summed to 2,');
  });

  it('accepts NaN outside the mask and replaces it (image 0, noise 1)', () => {
    // (0, 2) is in column 0, outside the mask; (4, 3) is the other masked-out pixel.
    const folder = writeDataFolder(root, {
      image: { ...goodContent().image, data: withPixel(withPixel(goodImage(), 0, 2, Number.NaN), 4, 3, Number.POSITIVE_INFINITY) },
      noise: { ...goodContent().noise, data: withPixel(withPixel(goodNoise(), 0, 2, Number.NaN), 0, 1, 0) },
    });
    const data = loadObservedData({ folder });
    expect(data.image[0 + COLUMNS * 2]).toBe(0);
    expect(data.image[4 + COLUMNS * 3]).toBe(0);
    expect(data.noise[0 + COLUMNS * 2]).toBe(1);
    expect(data.noise[0 + COLUMNS * 1]).toBe(1);
    expect(Array.from(data.image).every(Number.isFinite)).toBe(true);
    expect(Array.from(data.noise).every((v) => v > 0 && Number.isFinite(v))).toBe(true);
    expect(data.notices.join('\n')).toContain(`${join(folder, 'image.fits')}: 2 pixels outside the mask`);
    expect(data.notices.join('\n')).toContain(`${join(folder, 'noise.fits')}: 1 pixels outside the mask`);
  });

  it('takes the pixel scale from the caller when the header has none, and says so', () => {
    const bare = { ...goodContent() };
    const folder = writeDataFolder(root, {
      image: { ...bare.image, cards: [] }, noise: { ...bare.noise, cards: [] }, psf: { ...bare.psf, cards: [] }, mask: { ...bare.mask, cards: [] },
    });
    const data = loadObservedData({ folder }, { pixelScaleArcsec: 0.04 });
    expect(data.pixelScaleArcsec).toBe(0.04);
    expect(data.notices.join('\n')).toMatch(/no pixel scale.*0\.04 arcsec/);
  });

  it('accepts a header pixel scale within the 1e-6 relative tolerance', () => {
    expect(PIXEL_SCALE_RELATIVE_TOLERANCE).toBe(1e-6);
    const folder = writeDataFolder(root);
    const data = loadObservedData({ folder }, { pixelScaleArcsec: PIXEL_SCALE_ARCSEC * (1 + 5e-7) });
    expect(data.pixelScaleArcsec).toBeCloseTo(PIXEL_SCALE_ARCSEC, 14);
  });
});

describe('config against data: a notice only where they differ (own contract)', () => {
  it('says nothing of a PSF and mask the data share with the config, and names the one used where they differ', () => {
    const yaml = (fwhm: number, outer: number): string => `observation: { columns: 40, rows: 40, pixelScaleArcsec: 0.09, supersampling: 1,
  psf: { shape: gaussian, fwhmArcsec: ${fwhm}, sizePixels: 7 }, noise: { skySigma: 0.012, integrationSeconds: 3000 },
  mask: { shape: annulus, innerRadiusArcsec: 0.5, outerRadiusArcsec: ${outer} } }
redshifts: { lens: 0.5, source: 2 }
lens: { mass: [{ kind: isothermalEllipsoid, einsteinRadiusArcsec: 1.1, axisRatio: 0.8, positionAngleDeg: 40, centerXArcsec: 0, centerYArcsec: 0 }] }
source: { light: [{ kind: ellipticalGaussian, amplitude: 5, sigmaArcsec: 0.1, axisRatio: 1, positionAngleDeg: 0, centerXArcsec: 0.1, centerYArcsec: 0 }] }
`;
    const same = parseConfig(parse(yaml(0.18, 1.7)), join(root, 'same.yaml'));
    const folder = join(root, 'simulated');
    simulateToFolder(same, folder, { seed: 1, noiseless: false });
    const expectation = (config: typeof same) => ({ observation: config.observation, configFile: config.file });
    expect(loadObservedData({ folder }, expectation(same)).notices).toEqual([]);
    const other = parseConfig(parse(yaml(0.3, 1.5)), join(root, 'other.yaml'));
    const notices = loadObservedData({ folder }, expectation(other)).notices.join('\n');
    expect(notices).toMatch(/PSF: the data's .*psf\.fits is used; .*other\.yaml's observation\.psf \(gaussian, FWHM 0\.3"\) is ignored/);
    expect(notices).toMatch(/mask: the data's .*mask\.fits is used; .*other\.yaml's observation\.mask \(annulus 0\.5" to 1\.5" about \(0", 0"\)\) is ignored/);
  });
});

describe('refused data: InputError naming the file and pixel (own validation contract, common practice)', () => {
  const good = goodContent();

  it('a missing file', () => {
    const folder = writeDataFolder(root, { noise: null });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(join(folder, 'noise.fits'));
    expect(error.message).toContain(join(folder, 'noise.fits'));
    expect(error.message).toMatch(/noise file missing.*found nothing/);
  });

  it('a missing explicit mask (only the folder default may be absent)', () => {
    const folder = writeDataFolder(root);
    const path = join(folder, 'no-such-mask.fits');
    const error = inputErrorOf(() => loadObservedData({ folder, mask: path }));
    expect(error.message).toContain(path);
    expect(error.message).toContain('mask file missing');
  });

  it('a missing folder, and no folder nor path at all', () => {
    const path = join(root, 'not-there');
    expect(inputErrorOf(() => loadObservedData({ folder: path })).message).toContain(path);
    expect(inputErrorOf(() => loadObservedData({})).message).toMatch(/no image file: expected a data folder or an explicit image path/);
  });

  it('a file that is not FITS', () => {
    const folder = writeDataFolder(root);
    const path = join(folder, 'psf.fits');
    rmSync(path);
    writeFileSync(path, 'column,row,value\n0,0,1\n');
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(path);
    expect(error.message).toContain(`${path}: psf file`);
    expect(error.message).toContain('not a FITS file');
  });

  it('a FITS file holding no 2-D image', () => {
    const folder = writeDataFolder(root);
    const path = join(folder, 'noise.fits');
    writeFits(path, { primary: { cards: [] } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(path);
    expect(error.message).toContain(`${path}: noise file`);
    expect(error.message).toContain('no HDU holds a 2-D image');
  });

  it('noise shape disagreeing with the image', () => {
    const folder = writeDataFolder(root, { noise: { data: new Float64Array(COLUMNS * 3).fill(1), nx: COLUMNS, ny: 3 } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(join(folder, 'noise.fits'));
    expect(error.message).toContain(`expected ${COLUMNS} x ${ROWS} pixels`);
    expect(error.message).toContain(`found ${COLUMNS} x 3`);
    expect(error.place.key).toBe('NAXIS2');
  });

  it('mask shape disagreeing with the image', () => {
    const folder = writeDataFolder(root, { mask: { data: new Float64Array(6 * ROWS).fill(1), nx: 6, ny: ROWS, bitpix: 8 } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(join(folder, 'mask.fits'));
    expect(error.message).toContain(`found 6 x ${ROWS}`);
    expect(error.place.key).toBe('NAXIS1');
  });

  it('image shape disagreeing with the config', () => {
    const folder = writeDataFolder(root);
    const error = inputErrorOf(() => loadObservedData({ folder }, { columns: 8, rows: ROWS }));
    expect(error.place.file).toBe(join(folder, 'image.fits'));
    expect(error.message).toContain(`expected 8 x ${ROWS} pixels`);
    expect(error.message).toContain("the config's observation");
    expect(error.message).toContain(`found ${COLUMNS} x ${ROWS}`);
  });

  it('an even-sized PSF', () => {
    const folder = writeDataFolder(root, { psf: { data: new Float64Array(12).fill(1 / 12), nx: 4, ny: 3 } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(join(folder, 'psf.fits'));
    expect(error.message).toMatch(/PSF kernel columns: expected an odd whole number.*found 4/);
  });

  it('NaN inside the mask, named as (column, row) the way astropy indexes it', () => {
    // (3, 1) is inside the mask. Outside reference for the pixel naming: astropy reads the file
    // as data[row, column] (numpy order), so argwhere(isnan) gives [row, column] = [1, 3].
    const folder = writeDataFolder(root, { image: { ...good.image, data: withPixel(goodImage(), 3, 1, Number.NaN) } });
    const path = join(folder, 'image.fits');
    const script = 'import sys, numpy, astropy.io.fits as f\nprint(numpy.argwhere(numpy.isnan(f.getdata(sys.argv[1])))[0].tolist())';
    const [row, column] = JSON.parse(execFileSync(PYTHON, ['-c', script, path], { encoding: 'utf8' })) as [number, number];
    expect([column, row]).toEqual([3, 1]);
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place).toEqual({ file: path, pixel: [column, row] });
    expect(error.message).toBe(`${path}, pixel (3, 1) (column, row, counted from 0): image value: expected a finite value inside the mask, found NaN`);
  });

  it('an infinite noise value inside the mask', () => {
    const folder = writeDataFolder(root, { noise: { ...good.noise, data: withPixel(goodNoise(), 2, 3, Number.NEGATIVE_INFINITY) } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place).toEqual({ file: join(folder, 'noise.fits'), pixel: [2, 3] });
    expect(error.message).toContain('found -Infinity');
  });

  it('zero or negative noise inside the mask', () => {
    for (const value of [0, -0.1]) {
      const folder = writeDataFolder(root, { noise: { ...good.noise, data: withPixel(goodNoise(), 1, 0, value) } });
      const error = inputErrorOf(() => loadObservedData({ folder }));
      expect(error.place).toEqual({ file: join(folder, 'noise.fits'), pixel: [1, 0] });
      expect(error.message).toContain(`noise value (1-sigma): expected a finite value above 0 inside the mask, found ${value}`);
    }
  });

  it('a mask value of 2', () => {
    const folder = writeDataFolder(root, { mask: { ...good.mask, data: withPixel(goodMask(), 2, 2, 2) } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place).toEqual({ file: join(folder, 'mask.fits'), pixel: [2, 2] });
    expect(error.message).toContain('mask value: expected 0 (pixel not used) or 1 (pixel used), found 2');
  });

  it('a mask that uses no pixel', () => {
    const folder = writeDataFolder(root, { mask: { ...good.mask, data: new Float64Array(COLUMNS * ROWS) } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(join(folder, 'mask.fits'));
    expect(error.message).toContain('mask uses no pixel');
  });

  it('a header pixel scale disagreeing with the config beyond 1e-6 relative', () => {
    const folder = writeDataFolder(root);
    const expected = PIXEL_SCALE_ARCSEC * (1 + 2e-6);
    const error = inputErrorOf(() => loadObservedData({ folder }, { pixelScaleArcsec: expected }));
    expect(error.place).toEqual({ file: join(folder, 'image.fits'), key: 'CDELT1' });
    expect(error.message).toContain(`expected ${expected} arcsec`);
    expect(error.message).toContain('found 0.05');
  });

  it('a PSF header whose pixel scale disagrees with the image', () => {
    const folder = writeDataFolder(root, { psf: { ...good.psf, cards: scaleCards(0.1) } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(join(folder, 'psf.fits'));
    expect(error.message).toContain('psf file pixel scale disagrees with the image');
  });

  it('no pixel scale anywhere', () => {
    const folder = writeDataFolder(root, { image: { ...good.image, cards: [] } });
    const error = inputErrorOf(() => loadObservedData({ folder }));
    expect(error.place.file).toBe(join(folder, 'image.fits'));
    expect(error.message).toContain('no pixel scale');
  });
});
