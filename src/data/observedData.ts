import type { CelestialWcsDescription } from '../fits/index.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import type { CutoutBox } from './cutoutBox.js';

/**
 * The files an observed data set was read from, after folder defaults were applied, as written
 * (an HDU choice such as `obs.fits[SCI]` included).
 */
export interface ObservedDataFiles {
  readonly image: string;
  /** The 1-sigma noise map; absent when the noise came from a weight map. */
  readonly noise?: string;
  /** The inverse-variance (weight) map the noise came from, when it did. */
  readonly weight?: string;
  /** Absent when the data brought no PSF and the config's was used. */
  readonly psf?: string;
  /** Absent when no mask file was given or found: then the config's mask, or every pixel. */
  readonly mask?: string;
}

/**
 * An observed lens image checked and ready for fitting. Pixel arrays are row-major: index
 * i + columns * j is column i of row j, row 0 being the first row stored in the FITS file
 * (the bottom row, see DEVELOPERS.md).
 *
 * Inside the mask every image and noise value is finite and every noise value is positive.
 * Outside it the image holds 0 and the noise 1, whatever the files held there (NaN included),
 * so code that loops over all pixels never meets NaN or a zero noise.
 *
 * image, noise, mask, usedPixels and psf.values live on SharedArrayBuffers (see
 * sharedArrays.ts): posting an ObservedData to a worker thread shares these arrays instead of
 * copying them. They must be treated as read-only by every thread.
 */
export interface ObservedData {
  readonly files: ObservedDataFiles;
  /** sha256 of each file's bytes (the whole file, whichever HDU was read), keyed as in `files`; absent for data made in memory. */
  readonly fileSha256?: Readonly<Partial<Record<keyof ObservedDataFiles, string>>>;
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
  /** Counts/s per pixel, converted from the file's BUNIT (see `imageUnit`). */
  readonly image: Float64Array<SharedArrayBuffer>;
  /** Per-pixel 1-sigma noise, in the image's unit. */
  readonly noise: Float64Array<SharedArrayBuffer>;
  /** Odd-sized in both axes, summing to 1, on the image's pixel scale (from the data, or the config's). */
  readonly psf: PsfKernel;
  /** 1 = pixel used in the fit, 0 = not. */
  readonly mask: Uint8Array<SharedArrayBuffer>;
  /** Row-major indices i + columns * j of the pixels with mask 1, in increasing order. */
  readonly usedPixels: Int32Array<SharedArrayBuffer>;
  /** What was assumed or changed while loading (mask absent, PSF renormalised, ...), for the user. */
  readonly notices: readonly string[];
  /** The sky coordinates of the pixels (after any cut-out), when the image header has a celestial TAN WCS. */
  readonly wcs?: CelestialWcsDescription;
  /** The PSF as the data gave it, `factor` cells per image pixel, when finer than the image (for sub-pixel use). */
  readonly psfOversampled?: { readonly factor: number; readonly kernel: PsfKernel };
  /** The part of the image file's frame these pixels are, when a cut-out was asked for. */
  readonly cutout?: CutoutBox;
  /** How the image's values became counts per second (BUNIT, EXPTIME), in words. */
  readonly imageUnit?: string;
}
