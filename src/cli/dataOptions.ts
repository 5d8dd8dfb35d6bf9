import type { Argv } from 'yargs';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { loadObservedData, type CutoutRequest, type ObservedData } from '../data/index.js';
import { InputError, expectedFound } from '../errors.js';

export interface DataArguments {
  data?: string;
  image?: string;
  noise?: string;
  weight?: string;
  psf?: string;
  mask?: string;
  'psf-oversampling'?: number;
  'cutout-box'?: string;
  'cutout-sky'?: string;
}

const HDU_NOTE = 'FITS; FILE[NAME] or FILE[N] picks one HDU of a multi-extension file';

/** The options naming the observed data: a folder and/or explicit FITS files, HDUs, a cut-out. */
export function withDataOptions<T>(y: Argv<T>): Argv<T & DataArguments> {
  return y
    .option('data', { type: 'string', describe: 'folder with image.fits, noise.fits, and optionally psf.fits and mask.fits (as `simulate` writes)' })
    .option('image', { type: 'string', describe: `observed image (${HDU_NOTE}, e.g. obs.fits[SCI]); BUNIT and EXPTIME turn it into counts/s` })
    .option('noise', { type: 'string', describe: `per-pixel 1-sigma noise (${HDU_NOTE}, e.g. obs.fits[ERR])` })
    .option('weight', { type: 'string', describe: `instead of --noise: inverse-variance map in the image's unit, 0 = no data (${HDU_NOTE}, e.g. obs.fits[WHT])` })
    .option('psf', { type: 'string', describe: `PSF kernel, odd-sized (${HDU_NOTE}) [default: the folder's psf.fits, else the config's observation.psf]` })
    .option('psf-oversampling', { type: 'number', describe: 'PSF cells per image pixel along each axis, when the PSF file has no OVERSAMP' })
    .option('mask', { type: 'string', describe: `mask, 1 = pixel used (${HDU_NOTE}) [default: the folder's mask.fits, else the config's observation.mask, else every pixel]` })
    .option('cutout-box', { type: 'string', describe: 'fit part of the image: COLUMN0,ROW0,COLUMNS,ROWS in pixels counted from 0' })
    .option('cutout-sky', { type: 'string', describe: 'fit part of the image: RA,DEC,SIDE (degrees, degrees, arcsec), a square about a sky position (needs a celestial WCS)' })
    .conflicts('noise', 'weight')
    .conflicts('cutout-box', 'cutout-sky') as Argv<T & DataArguments>;
}

function numbers(option: string, text: string, count: number, what: string): number[] {
  const values = text.split(',').map((part) => Number(part.trim()));
  if (values.length !== count || values.some((v) => !Number.isFinite(v))) {
    throw new InputError(`--${option}: ${expectedFound(`${count} numbers ${what}, separated by commas`, text)}`);
  }
  return values;
}

/** The cut-out the options ask for, if any. */
function cutoutOf(args: DataArguments): CutoutRequest | undefined {
  if (args['cutout-box'] !== undefined) {
    const [column0, row0, columns, rows] = numbers('cutout-box', args['cutout-box'], 4, 'COLUMN0,ROW0,COLUMNS,ROWS');
    return { kind: 'pixels', column0, row0, columns, rows };
  }
  if (args['cutout-sky'] !== undefined) {
    const [raDeg, decDeg, sideArcsec] = numbers('cutout-sky', args['cutout-sky'], 3, 'RA,DEC,SIDE (degrees, degrees, arcsec)');
    if (!(sideArcsec > 0)) throw new InputError(`--cutout-sky: ${expectedFound('a side in arcsec > 0', sideArcsec)}`);
    return { kind: 'sky', raDeg, decDeg, sideArcsec };
  }
  return undefined;
}

/** Loads and checks the observed data against the config's observation, printing the notices. */
export function loadDataOf(args: DataArguments, config: ArcsiftConfig): ObservedData {
  if (args.data === undefined && args.image === undefined) {
    throw new InputError('name the observed data with --data DIR, or --image with --noise or --weight (and --psf and --mask where the config has none)');
  }
  const oversampling = args['psf-oversampling'];
  const data = loadObservedData(
    {
      folder: args.data, image: args.image, noise: args.noise, weight: args.weight, psf: args.psf, mask: args.mask,
      psfOversampling: oversampling === undefined ? undefined : wholeNumberOption('psf-oversampling', oversampling, 1),
      cutout: cutoutOf(args),
    },
    {
      columns: config.observation.columns,
      rows: config.observation.rows,
      pixelScaleArcsec: config.observation.pixelScaleArcsec,
      from: `the observation in ${config.file}`,
      observation: config.observation,
      configFile: config.file,
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

/** Checks an option that takes any finite number (a threshold). */
export function finiteNumberOption(name: string, value: number): number {
  if (!Number.isFinite(value)) throw new InputError(`--${name}: ${expectedFound('a number', value)}`);
  return value;
}
