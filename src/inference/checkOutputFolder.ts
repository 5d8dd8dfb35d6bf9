import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';

/** Refuses to overwrite an unfinished run unless resuming, and a finished one in any case. */
export function checkOutputFolder(folder: string, resume: boolean, checkpointFolders: readonly string[]): void {
  if (existsSync(join(folder, 'summary.json')) && !resume) {
    throw new InputError(`${folder} already holds a finished run (summary.json); choose another --out or remove it`);
  }
  const unfinished = checkpointFolders.some((f) => existsSync(join(folder, f, 'checkpoint.json')));
  if (unfinished && !resume) {
    throw new InputError(`${folder} holds an interrupted run; pass --resume to continue it, or choose another --out`);
  }
}
