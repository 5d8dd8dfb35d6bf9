import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import type { ObservedDataFiles } from './observedData.js';

/** Where to find an observed data set: a folder with the default names, and/or explicit paths. */
export interface ObservedDataSource {
  /** Folder holding image.fits, noise.fits, psf.fits and optionally mask.fits. */
  readonly folder?: string;
  /** Explicit paths override the folder's default names; they are used as given, not joined to the folder. */
  readonly image?: string;
  readonly noise?: string;
  readonly psf?: string;
  readonly mask?: string;
}

/** The file names `arcsift simulate` writes and a folder is searched for. */
export const DATA_FILE_NAMES = {
  image: 'image.fits',
  noise: 'noise.fits',
  psf: 'psf.fits',
  mask: 'mask.fits',
} as const;

export type DataFileRole = keyof typeof DATA_FILE_NAMES;

/** What each file must hold, for messages. */
export const DATA_FILE_ROLES: Readonly<Record<DataFileRole, string>> = {
  image: 'the observed image',
  noise: 'the per-pixel 1-sigma noise map',
  psf: 'the PSF kernel',
  mask: 'the mask (1 = pixel used, 0 = not)',
};

function describeFound(path: string): string | undefined {
  if (!existsSync(path)) return 'nothing at this path';
  return statSync(path).isFile() ? undefined : 'a folder, not a file';
}

function requireFile(path: string, role: DataFileRole): string {
  const found = describeFound(path);
  if (found !== undefined) {
    throw new InputError(`${role} file missing: expected a FITS file holding ${DATA_FILE_ROLES[role]}, found ${found}`, { file: path });
  }
  return path;
}

/**
 * The files of a data set: explicit paths where given, else the folder's default names. Image,
 * noise and PSF must exist; an explicit mask must exist, the folder's mask.fits may be absent
 * (`mask` is then undefined). Throws InputError naming the missing file or folder.
 */
export function resolveDataFiles(source: ObservedDataSource): ObservedDataFiles {
  const { folder } = source;
  if (folder !== undefined) {
    const found = describeFound(folder);
    if (found === 'nothing at this path') {
      throw new InputError(`data folder missing: expected a folder holding ${Object.values(DATA_FILE_NAMES).join(', ')}, found ${found}`, { file: folder });
    }
    if (found === undefined) throw new InputError('data folder: expected a folder, found a file', { file: folder });
  }
  const required = (role: 'image' | 'noise' | 'psf'): string => {
    const path = source[role] ?? (folder === undefined ? undefined : join(folder, DATA_FILE_NAMES[role]));
    if (path === undefined) {
      throw new InputError(`no ${role} file: expected a data folder or an explicit ${role} path, found neither`, { key: role });
    }
    return requireFile(path, role);
  };
  const files = { image: required('image'), noise: required('noise'), psf: required('psf') };
  if (source.mask !== undefined) return { ...files, mask: requireFile(source.mask, 'mask') };
  if (folder !== undefined) {
    const maskPath = join(folder, DATA_FILE_NAMES.mask);
    if (existsSync(maskPath)) return { ...files, mask: requireFile(maskPath, 'mask') };
  }
  return files;
}
