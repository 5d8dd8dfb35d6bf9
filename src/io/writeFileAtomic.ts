import { renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { fileSystemFault } from './fileSystemFault.js';
import { makeFolder } from './makeFolder.js';

/**
 * Writes a file so that a reader (or a killed run) never sees it half-written: the bytes go to
 * a temporary name in the same folder, then one rename puts them in place. A fault of the place
 * (permission, read-only, full disk, a file where a folder should be) is an InputError naming
 * the path, and the temporary file is removed.
 */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  makeFolder(dirname(path));
  const temporary = `${path}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
  try {
    writeFileSync(temporary, data);
    renameSync(temporary, path);
  } catch (error) {
    rmSync(temporary, { force: true });
    throw fileSystemFault(error, path);
  }
}

/** JSON flavour of writeFileAtomic, with a trailing newline. */
export function writeJsonAtomic(path: string, value: unknown): void {
  writeFileAtomic(path, `${JSON.stringify(value, null, 2)}\n`);
}
