import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../errors.js';

/** Whether a summary file says its run was cut short (finished: false). */
function cutShort(file: string): boolean {
  try {
    return (JSON.parse(readFileSync(file, 'utf8')) as { finished?: unknown }).finished === false;
  } catch {
    return false;
  }
}

/**
 * Refuses, unless resuming, a folder that holds a run: one cut short (its summary says finished:
 * false), a finished one, or an interrupted one (a checkpoint in one of `checkpointFolders`).
 */
export function checkOutputFolder(folder: string, resume: boolean, checkpointFolders: readonly string[], summaryName = 'summary.json'): void {
  const summary = join(folder, summaryName);
  if (existsSync(summary) && !resume) {
    throw new InputError(cutShort(summary)
      ? `${folder} holds a run a limit cut short (${summaryName} says finished: false); pass --resume (with a larger limit) to continue it, or choose another --out`
      : `${folder} already holds a finished run (${summaryName}); choose another --out or remove it`);
  }
  const unfinished = checkpointFolders.some((f) => existsSync(join(folder, f, 'checkpoint.json')));
  if (unfinished && !resume) {
    throw new InputError(`${folder} holds an interrupted run; pass --resume to continue it, or choose another --out`);
  }
}
