/** Peak memory of the running process, for the benchmarks. */
import { readFileSync } from 'node:fs';

/**
 * The peak resident memory of this process image. Linux keeps getrusage's maxrss across fork and
 * exec, so a child started by a large parent would report the parent's size; VmHWM in
 * /proc/self/status is the high-water mark of this image alone. Elsewhere, maxrss.
 */
export function peakResidentBytes(): number {
  try {
    const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync('/proc/self/status', 'utf8'));
    if (m) return Number(m[1]) * 1024;
  } catch {
    // not Linux: fall through
  }
  return process.resourceUsage().maxRSS * 1024;
}
