import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

/** The built CLI (`npm test` runs tsc first, so dist/ is current). */
export const cliPath = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));

/** Runs `arcsift ARGS` in a child process; its exit status, standard output and standard error. */
export function runCli(args: readonly string[]): { status: number | null; stdout: string; stderr: string } {
  const result = spawnSync(process.execPath, [cliPath, ...args], { encoding: 'utf8', timeout: 60_000 });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}
