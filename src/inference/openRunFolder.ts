import { acquireRunLock, type RunLock } from '../io/runLock.js';
import { checkOutputFolder } from './checkOutputFolder.js';

/** How a command takes its output folder. */
export interface RunFolderOptions {
  /** Continue the run the folder holds. */
  readonly resume: boolean;
  /** Sub-folders that may hold a checkpoint ('' the folder itself); a function when they depend on what is there. */
  readonly checkpointFolders: readonly string[] | (() => readonly string[]);
  /** The file a finished run writes last (default summary.json). */
  readonly summaryName?: string;
  /** The command line, recorded in the lock for whoever finds it. */
  readonly command: string;
  /** Take over a lock held by a run on another host. */
  readonly takeOverLock?: boolean;
  readonly onNotice?: (text: string) => void;
}

/**
 * Takes `folder` for one run before anything is sampled: its lock (acquireRunLock, which also
 * proves the folder writable), then the check of what it holds (checkOutputFolder). The caller
 * releases the lock when the run ends, whatever the outcome.
 */
export function openRunFolder(folder: string, options: RunFolderOptions): RunLock {
  const lock = acquireRunLock(folder, { command: options.command, takeOverFromOtherHost: options.takeOverLock, onNotice: options.onNotice });
  try {
    const folders = typeof options.checkpointFolders === 'function' ? options.checkpointFolders() : options.checkpointFolders;
    checkOutputFolder(folder, options.resume, folders, options.summaryName);
  } catch (error) {
    lock.release();
    throw error;
  }
  return lock;
}
