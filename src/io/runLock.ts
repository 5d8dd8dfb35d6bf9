import { closeSync, existsSync, openSync, readdirSync, readFileSync, renameSync, rmdirSync, rmSync, statSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { InputError } from '../errors.js';
import { fileSystemFault } from './fileSystemFault.js';
import { makeFolder } from './makeFolder.js';

/** The lock file of an output folder. */
export const LOCK_FILE = 'arcsift.lock';

/** Who holds a folder: written into the lock file as JSON. */
export interface LockOwner {
  readonly pid: number;
  readonly host: string;
  /** The process's start in clock ticks after boot (/proc/PID/stat field 22), to tell a reused pid; null where unknown. */
  readonly processStart: number | null;
  readonly startedAt: string;
  readonly command: string;
}

/** A folder's lock, held by this process. */
export interface RunLock {
  readonly file: string;
  /** Removes the lock (and the folder, when taking the lock made it and it is empty again). Safe to call twice. */
  release(): void;
}

/** Field 22 of /proc/PID/stat, the process's start time; null where /proc is not there or the process is gone. */
function processStartOf(pid: number): number | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // The command name (field 2) is in parentheses and may hold spaces: count fields after its ')'.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    const start = Number(fields[19]);
    return Number.isFinite(start) ? start : null;
  } catch {
    return null;
  }
}

/** Whether the owner of a lock on this host still runs: its pid exists and, where known, started when it did. */
function ownerAlive(owner: LockOwner): boolean {
  try {
    process.kill(owner.pid, 0);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'EPERM') return false;
  }
  const start = processStartOf(owner.pid);
  return owner.processStart === null || start === null || start === owner.processStart;
}

function readOwner(file: string): LockOwner | null {
  try {
    const owner = JSON.parse(readFileSync(file, 'utf8')) as LockOwner;
    return typeof owner.pid === 'number' && typeof owner.host === 'string' ? owner : null;
  } catch {
    return null;
  }
}

/** Creates the lock file with `owner` in it, or false when one is there (O_CREAT | O_EXCL: one creator wins). */
function create(file: string, owner: LockOwner): boolean {
  let fd: number;
  try {
    fd = openSync(file, 'wx');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') return false;
    throw fileSystemFault(error, file, 'the lock file of the output folder');
  }
  try {
    writeSync(fd, `${JSON.stringify(owner)}\n`);
  } catch (error) {
    closeSync(fd);
    rmSync(file, { force: true });
    throw fileSystemFault(error, file, 'the lock file of the output folder');
  }
  closeSync(fd);
  return true;
}

const describeOwner = (o: LockOwner): string => `pid ${o.pid} on ${o.host}, started ${o.startedAt}: ${o.command}`;

/**
 * Takes `folder` for one run: makes it if needed and creates its lock file holding this process's
 * pid, host, start time and command, which also proves the folder writable before any sampling.
 * Refused with an InputError when another live run holds it, or when a run on another host does
 * (this host cannot tell whether it still runs) unless `takeOverFromOtherHost`. A lock left by a
 * run of this host that is gone (a crash, kill -9) is taken over, and `onNotice` says so. A file
 * system fault (permission, read-only, full, a file where the folder should be) is an InputError
 * naming the path.
 */
export function acquireRunLock(
  folder: string, options: { readonly command: string; readonly takeOverFromOtherHost?: boolean; readonly onNotice?: (text: string) => void },
): RunLock {
  const made = !existsSync(folder);
  makeFolder(folder, 'the output folder');
  if (!statSync(folder).isDirectory()) throw new InputError('cannot write the output folder: a file stands where it should be', { file: folder });
  const file = join(folder, LOCK_FILE);
  /** The folder as it was found: removed again when taking the lock made it and it stays empty. */
  const tidy = (): void => {
    try {
      if (made && readdirSync(folder).length === 0) rmdirSync(folder);
    } catch {
      // Nothing to tidy.
    }
  };
  const me: LockOwner = {
    pid: process.pid, host: hostname(), processStart: processStartOf(process.pid), startedAt: new Date().toISOString(), command: options.command,
  };
  let created: boolean;
  try {
    created = create(file, me);
  } catch (error) {
    tidy();
    throw error;
  }
  if (!created) {
    const owner = readOwner(file);
    if (owner === null) {
      throw new InputError(`cannot take the output folder: its lock file is being written or is not arcsift's; if no arcsift run uses ${folder}, remove the file`, { file });
    }
    if (owner.host === me.host && ownerAlive(owner)) {
      throw new InputError(`another arcsift run uses this folder (${describeOwner(owner)}); wait for it to end, or choose another --out`, { file });
    }
    if (owner.host !== me.host && options.takeOverFromOtherHost !== true) {
      throw new InputError(
        `an arcsift run on another host holds this folder (${describeOwner(owner)}), and whether it still runs cannot be told from ${me.host}; ` +
          'if it no longer does, pass --take-over-lock',
        { file },
      );
    }
    // Move the old lock aside first: of several runs taking over at once, one rename succeeds.
    const aside = `${file}.${process.pid}.stale`;
    try {
      renameSync(file, aside);
    } catch {
      throw new InputError('another arcsift run took this folder over at the same moment; wait for it to end, or choose another --out', { file });
    }
    rmSync(aside, { force: true });
    if (!create(file, me)) throw new InputError('another arcsift run took this folder over at the same moment', { file });
    options.onNotice?.(`took over the lock of ${folder} from ${describeOwner(owner)}, ${owner.host === me.host ? 'which no longer runs' : 'as --take-over-lock asked'}`);
  }
  let held = true;
  const release = (): void => {
    if (!held) return;
    held = false;
    process.off('exit', release);
    const owner = readOwner(file);
    if (owner !== null && owner.pid === me.pid && owner.host === me.host && owner.startedAt === me.startedAt) rmSync(file, { force: true });
    tidy();
  };
  process.on('exit', release);
  return { file, release };
}
