import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';

/** What a running process has used so far, as Linux's /proc tells it. */
export interface ProcessUsage {
  /** Largest resident memory so far (VmHWM of /proc/PID/status, every thread counted), MB. */
  readonly peakMemoryMb: number;
  /** User plus system CPU time of all its threads (utime + stime of /proc/PID/stat), seconds. */
  readonly cpuSeconds: number;
}

let ticksPerSecond: number | undefined;

/** Clock ticks per second of /proc's times (sysconf(_SC_CLK_TCK), 100 on Linux unless changed). */
function clockTicks(): number {
  if (ticksPerSecond === undefined) {
    const answer = spawnSync('getconf', ['CLK_TCK'], { encoding: 'utf8' });
    const value = Number(answer.stdout?.trim());
    ticksPerSecond = Number.isInteger(value) && value > 0 ? value : 100;
  }
  return ticksPerSecond;
}

/**
 * The memory and CPU time a process has used (proc(5): VmHWM; fields 14 and 15 of stat, after
 * the command name in parentheses). Null where /proc is not readable (not Linux, or the process
 * has ended).
 */
export function processUsage(pid: number): ProcessUsage | null {
  try {
    const memory = /^VmHWM:\s+(\d+)\s+kB/m.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    // fields[0] is field 3 (state), so utime (14) and stime (15) are fields[11] and fields[12].
    const cpuSeconds = (Number(fields[11]) + Number(fields[12])) / clockTicks();
    if (memory === null || !Number.isFinite(cpuSeconds)) return null;
    return { peakMemoryMb: Number(memory[1]) / 1024, cpuSeconds };
  } catch {
    return null;
  }
}
