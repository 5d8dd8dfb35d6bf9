import { spawnSync } from 'node:child_process';
import { chmodSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** True when this process may mount a file system (root with the capability, as in a CI container). */
export const canMount: boolean = (() => {
  if (process.getuid?.() !== 0) return false;
  const probe = mkdtempSync(join(tmpdir(), 'arcsift-mount-'));
  const mounted = spawnSync('mount', ['-t', 'tmpfs', '-o', 'size=16k', 'tmpfs', probe]).status === 0;
  if (mounted) spawnSync('umount', [probe]);
  rmSync(probe, { recursive: true, force: true });
  return mounted;
})();

/** A real small file system (tmpfs) at a fresh folder: read-only, or of `sizeKb` kilobytes. Needs canMount. */
export function smallFileSystem(options: { readonly sizeKb: number; readonly readOnly?: boolean }): { readonly path: string; unmount(): void } {
  const path = mkdtempSync(join(tmpdir(), 'arcsift-fs-'));
  const flags = `size=${options.sizeKb}k${options.readOnly === true ? ',ro' : ''}`;
  const mounted = spawnSync('mount', ['-t', 'tmpfs', '-o', flags, 'tmpfs', path], { encoding: 'utf8' });
  if (mounted.status !== 0) throw new Error(`mount failed: ${mounted.stderr}`);
  return {
    path,
    unmount: () => {
      spawnSync('umount', [path]);
      rmSync(path, { recursive: true, force: true });
    },
  };
}

/**
 * A folder this test's child processes may not write into, and how to spawn them: as root (who
 * may write anywhere) the child runs as the unprivileged user nobody (uid and gid 65534); otherwise
 * the folder is made read-only for its owner. `parent` must be readable by everyone.
 */
export function unwritableFolder(parent: string): { readonly path: string; readonly spawnAs: { uid?: number; gid?: number } } {
  const path = join(parent, 'not-yours');
  mkdirSync(path);
  chmodSync(path, 0o555);
  return { path, spawnAs: process.getuid?.() === 0 ? { uid: 65534, gid: 65534 } : {} };
}
