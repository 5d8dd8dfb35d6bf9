import { createHash } from 'node:crypto';
import { readFileBytes } from './readFileBytes.js';

/** sha256 of a file's bytes, in lower-case hex; an unreadable file is an InputError naming it. */
export function fileSha256(path: string): string {
  return createHash('sha256').update(readFileBytes(path)).digest('hex');
}
