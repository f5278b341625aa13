/**
 * The peak resident memory of another process on Linux: `VmHWM` of /proc/PID/status (the
 * high-water mark of its resident set, worker threads included, since they share the process),
 * reset between phases by writing 5 to /proc/PID/clear_refs (proc(5)). Elsewhere both are
 * unavailable and the figure is null.
 */
import { readFileSync, writeFileSync } from 'node:fs';

function statusField(pid: number, field: 'VmHWM' | 'VmRSS'): number | null {
  try {
    const match = new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return match ? Number(match[1]) * 1024 : null;
  } catch {
    return null;
  }
}

/**
 * The process's peak resident set since it started or since the last reset.
 * @param pid the process.
 * @returns bytes, or null where /proc is not there.
 */
export function peakRss(pid: number): number | null {
  return statusField(pid, 'VmHWM');
}

/**
 * The process's resident set now.
 * @param pid the process.
 * @returns bytes, or null where /proc is not there.
 */
export function currentRss(pid: number): number | null {
  return statusField(pid, 'VmRSS');
}

/**
 * Starts a new peak: the high-water mark becomes the current resident set.
 * @param pid the process (ours or a child: writing its clear_refs needs the same user).
 * @returns whether it could be reset.
 */
export function resetPeakRss(pid: number): boolean {
  try {
    writeFileSync(`/proc/${pid}/clear_refs`, '5');
    return true;
  } catch {
    return false;
  }
}

/** Bytes as MB (10^6), e.g. "412 MB"; "n/a" for null. */
export function megabytes(bytes: number | null): string {
  return bytes === null ? 'n/a' : `${Math.round(bytes / 1e6)} MB`;
}
