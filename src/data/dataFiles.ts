import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import { parseFitsLocator, type FitsLocator } from '../fits/index.js';
import type { CutoutRequest } from './cutoutBox.js';
import type { ObservedDataFiles } from './observedData.js';

/**
 * Where to find an observed data set: a folder with the default names, and/or explicit files.
 * An explicit file may name one HDU: `obs.fits[SCI]`, `obs.fits[ERR,1]`, `obs.fits[2]`.
 */
export interface ObservedDataSource {
  /** Folder holding image.fits, noise.fits, psf.fits and optionally mask.fits. */
  readonly folder?: string;
  /** Explicit files override the folder's default names; they are used as given, not joined to the folder. */
  readonly image?: string;
  /** The per-pixel 1-sigma noise. */
  readonly noise?: string;
  /** Instead of `noise`: an inverse-variance (weight) map, 1 / sigma^2 in the image's unit as stored; 0 marks a pixel without data. */
  readonly weight?: string;
  readonly psf?: string;
  readonly mask?: string;
  /** How many PSF cells per image pixel along each axis, when the PSF file does not say (OVERSAMP). */
  readonly psfOversampling?: number;
  /** A part of the image to fit instead of the whole frame. */
  readonly cutout?: CutoutRequest;
}

/** The file names `arcsift simulate` writes and a folder is searched for. */
export const DATA_FILE_NAMES = {
  image: 'image.fits',
  noise: 'noise.fits',
  psf: 'psf.fits',
  mask: 'mask.fits',
} as const;

export type DataFileRole = keyof typeof DATA_FILE_NAMES | 'weight';

/** What each file must hold, for messages. */
export const DATA_FILE_ROLES: Readonly<Record<DataFileRole, string>> = {
  image: 'the observed image',
  noise: 'the per-pixel 1-sigma noise map',
  weight: 'the inverse-variance (weight) map',
  psf: 'the PSF kernel',
  mask: 'the mask (1 = pixel used, 0 = not)',
};

function describeFound(path: string): string | undefined {
  if (!existsSync(path)) return 'nothing at this path';
  return statSync(path).isFile() ? undefined : 'a folder, not a file';
}

function requireFile(text: string, role: DataFileRole): string {
  const { path } = parseFitsLocator(text);
  const found = describeFound(path);
  if (found !== undefined) {
    throw new InputError(`${role} file missing: expected a FITS file holding ${DATA_FILE_ROLES[role]}, found ${found}`, { file: path });
  }
  return text;
}

/** The data files with their HDU choices read. */
export interface DataLocators {
  readonly image: FitsLocator;
  /** The noise map, or the weight map when `noiseIsWeight`. */
  readonly noise: FitsLocator;
  readonly noiseIsWeight: boolean;
  readonly psf: FitsLocator | undefined;
  readonly mask: FitsLocator | undefined;
}

/**
 * The files of a data set: explicit files where given, else the folder's default names. Image
 * and noise (or weight) must exist; an explicit PSF or mask must exist, the folder's psf.fits
 * and mask.fits may be absent (undefined: the caller decides what stands in). Throws
 * InputError naming the missing file or folder.
 */
export function resolveDataFiles(source: ObservedDataSource): { files: ObservedDataFiles; locators: DataLocators } {
  const { folder } = source;
  if (folder !== undefined) {
    const found = describeFound(folder);
    if (found === 'nothing at this path') {
      throw new InputError(`data folder missing: expected a folder holding ${Object.values(DATA_FILE_NAMES).join(', ')}, found ${found}`, { file: folder });
    }
    if (found === undefined) throw new InputError('data folder: expected a folder, found a file', { file: folder });
  }
  if (source.noise !== undefined && source.weight !== undefined) {
    throw new InputError('noise given twice: expected a 1-sigma noise map or a weight (inverse-variance) map, found both', { file: source.weight, key: 'weight' });
  }
  const inFolder = (role: keyof typeof DATA_FILE_NAMES): string | undefined => (folder === undefined ? undefined : join(folder, DATA_FILE_NAMES[role]));
  const required = (role: 'image' | 'noise' | 'weight', text: string | undefined): string => {
    if (text === undefined) {
      throw new InputError(`no ${role} file: expected a data folder or an explicit ${role} path, found neither`, { key: role });
    }
    return requireFile(text, role);
  };
  const optional = (role: 'psf' | 'mask'): string | undefined => {
    if (source[role] !== undefined) return requireFile(source[role], role);
    const path = inFolder(role);
    return path !== undefined && existsSync(path) ? requireFile(path, role) : undefined;
  };
  const image = required('image', source.image ?? inFolder('image'));
  const noiseIsWeight = source.weight !== undefined;
  const noise = noiseIsWeight ? required('weight', source.weight) : required('noise', source.noise ?? inFolder('noise'));
  const psf = optional('psf');
  const mask = optional('mask');
  const files: ObservedDataFiles = {
    image,
    ...(noiseIsWeight ? { weight: noise } : { noise }),
    ...(psf === undefined ? {} : { psf }),
    ...(mask === undefined ? {} : { mask }),
  };
  return {
    files,
    locators: {
      image: parseFitsLocator(image),
      noise: parseFitsLocator(noise),
      noiseIsWeight,
      psf: psf === undefined ? undefined : parseFitsLocator(psf),
      mask: mask === undefined ? undefined : parseFitsLocator(mask),
    },
  };
}
