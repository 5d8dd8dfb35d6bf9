import { existsSync, mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import { fileSystemFault } from './fileSystemFault.js';

/**
 * Makes a folder and the folders above it that are missing. A fault of the place is an InputError
 * naming the path (fileSystemFault). A recursive mkdir on a read-only file system reports ENOENT,
 * which hides the reason: the first missing folder is then made alone, which reports EROFS or
 * EACCES as it is.
 */
export function makeFolder(path: string, what = 'the folder'): void {
  try {
    mkdirSync(path, { recursive: true });
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw fileSystemFault(error, path, what);
    let first = path;
    while (!existsSync(dirname(first)) && dirname(first) !== first) first = dirname(first);
    try {
      mkdirSync(first);
    } catch (inner) {
      throw fileSystemFault(inner, path, what);
    }
    throw fileSystemFault(error, path, what);
  }
}
