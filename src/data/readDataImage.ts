import { InputError } from '../errors.js';
import { readFitsImage, type FitsImage, type FitsLocator } from '../fits/index.js';
import { DATA_FILE_ROLES, type DataFileRole } from './dataFiles.js';

/**
 * The image of one data file: the HDU its locator names, else the first 2-D image HDU. A file
 * that is not FITS, lacks that HDU or holds no 2-D image there throws the reader's InputError,
 * with the file's role (image, noise, ...) added and the file named as written (with its HDU).
 */
export function readDataImage(locator: FitsLocator, role: DataFileRole): FitsImage {
  try {
    return readFitsImage(locator.path, locator.selection);
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    throw new InputError(`${role} file (${DATA_FILE_ROLES[role]}) is not a readable 2-D FITS image: ${error.bareMessage}`, {
      ...error.place,
      file: locator.text,
    });
  }
}
