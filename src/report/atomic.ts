/**
 * Atomic file writes: each file is written to a temporary name in the same folder and renamed
 * into place, so an interrupted run never leaves a half-written file under the final name.
 * Its own small module so that the writers of result files and of pictures both use it
 * without importing each other.
 */
import { randomBytes } from 'node:crypto';
import { readdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

/** The mark of a temporary file: `<name>.raiser-tmp-<pid>-<random>`. */
const TMP_MARK = '.raiser-tmp-';

export function writeAtomic(path: string, data: string | Uint8Array): void {
  // Named per run (pid) and per write (random), so no two writers share a temporary file, and
  // cleaning can tell a dead run's leftovers from a live run's work.
  const tmp = `${path}${TMP_MARK}${process.pid}-${randomBytes(4).toString('hex')}`;
  try {
    writeFileSync(tmp, data);
    renameSync(tmp, path);
  } catch (err) {
    rmSync(tmp, { force: true });
    throw err;
  }
}

/**
 * Removes the temporary files in dir left by runs that have ended (a live run's are its own);
 * `alive` says whether a process id is still running.
 */
export function removeStaleTemporaries(dir: string, alive: (pid: number) => boolean): void {
  for (const f of readdirSync(dir)) {
    const at = f.indexOf(TMP_MARK);
    if (at < 0) continue;
    const pid = Number(/^(\d+)/.exec(f.slice(at + TMP_MARK.length))?.[1]);
    if (!alive(pid)) rmSync(join(dir, f), { force: true });
  }
}
