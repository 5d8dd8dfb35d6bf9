// Builds small observed-data folders for the loader tests with arcsift's own FITS writer.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { floatCard, stringCard, writeFitsImage, type Bitpix, type HeaderCard } from '../../src/fits/index.js';

export const COLUMNS = 5;
export const ROWS = 4;
export const PIXEL_SCALE_ARCSEC = 0.05;

/** CDELTn in degrees as `arcsift simulate` writes them (1 arcsec = 1/3600 deg, common practice). */
export function scaleCards(pixelScaleArcsec: number): HeaderCard[] {
  return [
    stringCard('CUNIT1', 'deg'), stringCard('CUNIT2', 'deg'),
    floatCard('CDELT1', pixelScaleArcsec / 3600), floatCard('CDELT2', pixelScaleArcsec / 3600),
  ];
}

/** Image value at (column i, row j): 10 j + i + 1, so a value names its pixel. */
export function goodImage(): Float64Array {
  return Float64Array.from({ length: COLUMNS * ROWS }, (_, k) => 10 * Math.floor(k / COLUMNS) + (k % COLUMNS) + 1);
}

/** Noise 0.5 + k / 100 at row-major index k: positive and distinct. */
export function goodNoise(): Float64Array {
  return Float64Array.from({ length: COLUMNS * ROWS }, (_, k) => 0.5 + k / 100);
}

/** A 3 x 3 kernel summing exactly to 1 (every value a multiple of 1/16, exact in binary). */
export function goodPsf(): Float64Array {
  return Float64Array.of(1, 2, 1, 2, 4, 2, 1, 2, 1).map((v) => v / 16);
}

/** Mask leaving out column 0 and pixel (4, 3): 1 elsewhere. */
export function goodMask(): Float64Array {
  return Float64Array.from({ length: COLUMNS * ROWS }, (_, k) => (k % COLUMNS === 0 || k === 4 + COLUMNS * 3 ? 0 : 1));
}

export interface FolderImage {
  readonly data: Float64Array;
  readonly nx: number;
  readonly ny: number;
  readonly bitpix?: Bitpix;
  readonly cards?: readonly HeaderCard[];
}

export interface FolderContent {
  readonly image?: FolderImage | null;
  readonly noise?: FolderImage | null;
  readonly psf?: FolderImage | null;
  readonly mask?: FolderImage | null;
}

/** The good data set. */
export function goodContent(): Record<keyof FolderContent, FolderImage> {
  const cards = scaleCards(PIXEL_SCALE_ARCSEC);
  // Image and noise say their unit, as `arcsift simulate` writes it.
  const withUnit = [...cards, stringCard('BUNIT', 'counts/s')];
  return {
    image: { data: goodImage(), nx: COLUMNS, ny: ROWS, cards: withUnit },
    noise: { data: goodNoise(), nx: COLUMNS, ny: ROWS, cards: withUnit },
    psf: { data: goodPsf(), nx: 3, ny: 3, cards },
    mask: { data: goodMask(), nx: COLUMNS, ny: ROWS, bitpix: 8, cards },
  };
}

/** A fresh temporary folder holding image.fits, noise.fits, psf.fits, mask.fits from `changes` over the good set. */
export function writeDataFolder(root: string, changes: FolderContent = {}): string {
  const folder = mkdtempSync(join(root, 'set-'));
  const content = { ...goodContent(), ...changes };
  for (const name of ['image', 'noise', 'psf', 'mask'] as const) {
    const file = content[name];
    if (file === null || file === undefined) continue;
    writeFitsImage(join(folder, `${name}.fits`), file);
  }
  return folder;
}

export function makeRoot(): { root: string; remove: () => void } {
  const root = mkdtempSync(join(tmpdir(), 'arcsift-data-'));
  return { root, remove: () => rmSync(root, { recursive: true, force: true }) };
}

/** A copy of `values` with `value` at (column i, row j). */
export function withPixel(values: Float64Array, i: number, j: number, value: number, columns = COLUMNS): Float64Array {
  const out = Float64Array.from(values);
  out[i + columns * j] = value;
  return out;
}
