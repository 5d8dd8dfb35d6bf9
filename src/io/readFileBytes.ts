import { readFileSync } from 'node:fs';
import { InputError } from '../errors.js';

/** The bytes of a file, or an InputError naming it when it cannot be read. */
export function readFileBytes(path: string): Uint8Array {
  try {
    return readFileSync(path);
  } catch (error) {
    throw new InputError(`cannot read the file: ${(error as Error).message}`, { file: path });
  }
}
