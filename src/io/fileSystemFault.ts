import { InputError } from '../errors.js';

/** What a file-system error code means for the user, for the codes that are the place's fault, not arcsift's. */
const REASONS: Readonly<Record<string, string>> = {
  EACCES: 'permission denied',
  EPERM: 'operation not permitted',
  EROFS: 'the file system is read-only',
  ENOSPC: 'no space left on the device',
  EDQUOT: 'the disk quota is used up',
  ENOTDIR: 'a file stands where a folder is needed on this path',
  EEXIST: 'a file stands where a folder is needed',
  EISDIR: 'a folder stands where a file is needed',
  ENOENT: 'a folder on this path does not exist (or was removed)',
  ENAMETOOLONG: 'the path is too long',
};

/**
 * An error of writing `path` as the user should see it: an InputError naming the path and what
 * the file system said (`cannot write the output folder ...: the file system is read-only
 * (EROFS)`) when the fault is the place's (permission, read-only, full, quota, a file where a
 * folder should be); any other error as it is.
 */
export function fileSystemFault(error: unknown, path: string, what = 'the file'): unknown {
  const code = (error as NodeJS.ErrnoException)?.code;
  const reason = code === undefined ? undefined : REASONS[code];
  if (reason === undefined) return error;
  return new InputError(`cannot write ${what}: ${reason} (${code})`, { file: path });
}
