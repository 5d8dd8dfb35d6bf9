import { closeSync, existsSync, mkdirSync, openSync, renameSync, rmSync, statSync, utimesSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { dirname } from 'node:path';
import { batchLayout } from './batchLayout.js';

/** A row's lock, held by one runner (a local batch or a Slurm task) while the row's job runs. */
export interface RowLock {
  /** Marks the lock alive (its modification time); called every heartbeat. */
  touch(): void;
  release(): void;
}

/** Seconds since the lock file was last touched, or null when there is none. */
export function lockAgeSeconds(out: string, id: string): number | null {
  const file = batchLayout.lockFile(out, id);
  try {
    return (Date.now() - statSync(file).mtimeMs) / 1000;
  } catch {
    return null;
  }
}

/** True when someone holds the row's lock and touched it within `staleSeconds`. */
export function rowLocked(out: string, id: string, staleSeconds: number): boolean {
  const age = lockAgeSeconds(out, id);
  return age !== null && age < staleSeconds;
}

function create(file: string, owner: string): boolean {
  try {
    const fd = openSync(file, 'wx');
    writeSync(fd, `${owner}\n`);
    closeSync(fd);
    return true;
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') return false;
    throw error;
  }
}

/**
 * Takes the row's lock, or returns null when another runner holds it. The lock is a file made
 * with O_CREAT | O_EXCL (atomic, also on NFS v3 and later). A lock untouched for `staleSeconds`
 * belonged to a runner that died (a killed task or node): it is renamed away first, which only
 * one of several runners doing the same at once can do, so only one of them takes the row.
 */
export function acquireRowLock(out: string, id: string, staleSeconds: number, owner: string): RowLock | null {
  const file = batchLayout.lockFile(out, id);
  mkdirSync(dirname(file), { recursive: true });
  const ownerLine = `${owner} on ${hostname()} pid ${process.pid} at ${new Date().toISOString()}`;
  if (!create(file, ownerLine)) {
    if (rowLocked(out, id, staleSeconds)) return null;
    const aside = `${file}.stale.${process.pid}`;
    try {
      renameSync(file, aside);
    } catch {
      return null;
    }
    rmSync(aside, { force: true });
    if (!create(file, ownerLine)) return null;
  }
  let held = true;
  return {
    touch() {
      if (!held) return;
      const now = new Date();
      try {
        utimesSync(file, now, now);
      } catch {
        // Removed by someone who took it as stale: nothing to keep alive.
      }
    },
    release() {
      if (!held) return;
      held = false;
      if (existsSync(file)) rmSync(file, { force: true });
    },
  };
}
