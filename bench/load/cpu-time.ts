/**
 * The CPU time another process has used on Linux: user + system time of /proc/PID/stat (fields
 * 14 and 15, in clock ticks of USER_HZ, 100 per second on Linux; proc(5)), worker threads
 * included since they share the process. On a shared machine this is the figure to trust for
 * the cost of a request: wall-clock latencies grow with other processes' load, CPU time much less.
 * Elsewhere it is unavailable and the figure is null.
 */
import { readFileSync } from 'node:fs';

/** Clock ticks per second of /proc/PID/stat (USER_HZ; 100 on every Linux architecture Node runs on). */
const TICKS_PER_SECOND = 100;

/**
 * The process's CPU time so far (user + system, all threads).
 * @param pid the process.
 * @returns milliseconds, or null where /proc is not there.
 */
export function cpuTimeMs(pid: number): number | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // The command name (field 2) is in parentheses and may hold spaces: count fields after it.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    const userTicks = Number(fields[11]);
    const systemTicks = Number(fields[12]);
    return ((userTicks + systemTicks) * 1000) / TICKS_PER_SECOND;
  } catch {
    return null;
  }
}
