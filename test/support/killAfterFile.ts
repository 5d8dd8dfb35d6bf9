import type { ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';

/**
 * Kills `child` with SIGKILL `delayMs` after `file` appears (polled every 50 ms), and resolves once
 * it has exited: an interruption in the middle of a run, after its first checkpoint.
 */
export async function killAfterFile(child: ChildProcess, file: string, delayMs: number): Promise<void> {
  await new Promise<void>((resolve) => {
    const timer = setInterval(() => {
      if (existsSync(file)) {
        clearInterval(timer);
        setTimeout(() => { child.kill('SIGKILL'); resolve(); }, delayMs);
      }
    }, 50);
  });
  if (child.exitCode === null && child.signalCode === null) await new Promise((resolve) => child.on('exit', resolve));
}
