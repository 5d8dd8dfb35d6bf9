import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

/** The built command line (dist/, which `npm test` builds first). */
export const CLI = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));

/** A child arcsift with its standard error collected, and a promise of its exit status. */
export function startArcsift(args: readonly string[]): { child: ChildProcess; stderr: () => string; exited: Promise<number | null> } {
  const child = spawn(process.execPath, [CLI, ...args], { stdio: ['ignore', 'ignore', 'pipe'] });
  let stderr = '';
  child.stderr?.on('data', (chunk: Buffer) => { stderr += chunk.toString('utf8'); });
  const exited = new Promise<number | null>((resolve) => { child.on('exit', (code) => resolve(code)); });
  return { child, stderr: () => stderr, exited };
}

/** Resolves once `done()` holds, polled every 50 ms; throws after `seconds`. */
export async function until(done: () => boolean, seconds = 60): Promise<void> {
  const end = Date.now() + seconds * 1000;
  while (!done()) {
    if (Date.now() > end) throw new Error(`timed out waiting (${seconds} s)`);
    await new Promise((resolve) => { setTimeout(resolve, 50); });
  }
}
