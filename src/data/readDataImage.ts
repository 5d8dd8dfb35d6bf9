import { InputError } from '../errors.js';
import { readFitsImage, type FitsImage } from '../fits/index.js';
import { DATA_FILE_ROLES, type DataFileRole } from './dataFiles.js';

/** The message of an InputError without the "file, key K, pixel (i, j): " prefix its constructor adds. */
function bareMessage(error: InputError): string {
  const where: string[] = [];
  if (error.place.file !== undefined) where.push(error.place.file);
  if (error.place.key !== undefined) where.push(`key ${error.place.key}`);
  if (error.place.pixel !== undefined) where.push(`pixel (${error.place.pixel[0]}, ${error.place.pixel[1]})`);
  const prefix = `${where.join(', ')}: `;
  return where.length > 0 && error.message.startsWith(prefix) ? error.message.slice(prefix.length) : error.message;
}

/**
 * The first 2-D image HDU of one data file. A file that is not FITS or holds no 2-D image
 * throws the reader's InputError, with the file's role (image, noise, ...) added to the message.
 */
export function readDataImage(path: string, role: DataFileRole): FitsImage {
  try {
    return readFitsImage(path);
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    throw new InputError(`${role} file (${DATA_FILE_ROLES[role]}) is not a readable 2-D FITS image: ${bareMessage(error)}`, {
      ...error.place,
      file: path,
    });
  }
}
