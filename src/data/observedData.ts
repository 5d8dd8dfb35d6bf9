import type { PsfKernel } from '../imaging/psfKernel.js';

/** The files an observed data set was read from, after folder defaults were applied. */
export interface ObservedDataFiles {
  readonly image: string;
  readonly noise: string;
  readonly psf: string;
  /** Absent when no mask file was given or found: then every pixel is used. */
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
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
  /** Counts/s per pixel (whatever unit the file holds; arcsift's simulations write counts/s). */
  readonly image: Float64Array<SharedArrayBuffer>;
  /** Per-pixel 1-sigma noise, in the image's unit. */
  readonly noise: Float64Array<SharedArrayBuffer>;
  /** Odd-sized in both axes, summing to 1, on the image's pixel scale. */
  readonly psf: PsfKernel;
  /** 1 = pixel used in the fit, 0 = not. */
  readonly mask: Uint8Array<SharedArrayBuffer>;
  /** Row-major indices i + columns * j of the pixels with mask 1, in increasing order. */
  readonly usedPixels: Int32Array<SharedArrayBuffer>;
  /** What was assumed or changed while loading (mask absent, PSF renormalised, ...), for the user. */
  readonly notices: readonly string[];
}
