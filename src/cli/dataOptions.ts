import type { Argv } from 'yargs';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { loadObservedData, type ObservedData } from '../data/index.js';
import { InputError, expectedFound } from '../errors.js';

export interface DataArguments {
  data?: string;
  image?: string;
  noise?: string;
  psf?: string;
  mask?: string;
}

/** The options naming the observed data: a folder and/or explicit FITS paths. */
export function withDataOptions<T>(y: Argv<T>): Argv<T & DataArguments> {
  return y
    .option('data', { type: 'string', describe: 'folder with image.fits, noise.fits, psf.fits and optionally mask.fits (as `simulate` writes)' })
    .option('image', { type: 'string', describe: 'observed image FITS (overrides the folder\'s)' })
    .option('noise', { type: 'string', describe: 'per-pixel 1-sigma noise FITS' })
    .option('psf', { type: 'string', describe: 'PSF kernel FITS (odd-sized)' })
    .option('mask', { type: 'string', describe: 'mask FITS, 1 = pixel used (default: every pixel)' }) as Argv<T & DataArguments>;
}

/** Loads and checks the observed data against the config's observation. */
export function loadDataOf(args: DataArguments, config: ArcsiftConfig): ObservedData {
  if (args.data === undefined && args.image === undefined) {
    throw new InputError('name the observed data with --data DIR (or --image, --noise, --psf and --mask)');
  }
  const data = loadObservedData(
    { folder: args.data, image: args.image, noise: args.noise, psf: args.psf, mask: args.mask },
    {
      columns: config.observation.columns,
      rows: config.observation.rows,
      pixelScaleArcsec: config.observation.pixelScaleArcsec,
      from: `the observation in ${config.file}`,
    },
  );
  for (const notice of data.notices) process.stderr.write(`notice: ${notice}\n`);
  return data;
}

/** Checks a whole-number option (seed, threads, live points). */
export function wholeNumberOption(name: string, value: number, min: number): number {
  if (!Number.isInteger(value) || value < min) throw new InputError(`--${name}: ${expectedFound(`a whole number >= ${min}`, value)}`);
  return value;
}
