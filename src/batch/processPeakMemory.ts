import { readFileSync } from 'node:fs';

/**
 * The peak resident memory of a running process in MB: VmHWM of /proc/PID/status (proc(5)),
 * which counts every thread of the process. Null where /proc is not readable (not Linux, or the
 * process has ended).
 */
export function processPeakMemoryMb(pid: number): number | null {
  try {
    const match = /^VmHWM:\s+(\d+)\s+kB/m.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return match === null ? null : Number(match[1]) / 1024;
  } catch {
    return null;
  }
}
