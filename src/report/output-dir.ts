/**
 * The output folder of a run: checked before any work (so a bad `-o` is said at once, not after
 * the solve), created one level at a time (Node's recursive mkdir loops forever under /proc),
 * and locked against a second run writing into it at the same time.
 *
 * The lock is a file `.raiser-lock` in the folder, created exclusively, holding the owner's pid,
 * host and start time. A lock whose owner is gone (a run that was killed) is stale: it is taken
 * over. A run releases its lock when it ends, however it ends short of being killed.
 */
import { accessSync, closeSync, constants, lstatSync, mkdirSync, openSync, readFileSync, rmSync, statSync, writeSync, type Stats } from 'node:fs';
import { hostname } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { ModelError } from '../model/errors.js';

const LOCK_FILE = '.raiser-lock';

/** What a path that is not a folder is, in words. */
function kindOf(st: Stats): string {
  if (st.isFile()) return 'a file';
  if (st.isCharacterDevice() || st.isBlockDevice()) return 'a device';
  if (st.isFIFO()) return 'a named pipe';
  if (st.isSocket()) return 'a socket';
  return 'not a folder';
}

/**
 * Checks that dir can be the output folder: an existing, writable folder, or a path whose
 * nearest existing ancestor is a writable folder. `option` names the flag in messages.
 */
export function checkOutputDir(dir: string, option: string): void {
  if (dir.trim() === '') {
    throw new ModelError(option, `the folder's name is empty`, `give ${option} the folder to write into, for example ${option} results`);
  }
  let st: Stats | undefined;
  try {
    st = statSync(dir);
  } catch (e) {
    const code = (e as { code?: string }).code;
    if (code === 'ENOTDIR') throw new ModelError(option, `${dir}: a part of this path is a file, not a folder`, 'give a folder path');
    if (code !== 'ENOENT') throw new ModelError(option, `${dir} cannot be used (${code ?? (e as Error).message})`, 'choose another folder');
  }
  if (st) {
    if (!st.isDirectory()) throw new ModelError(option, `${dir} is ${kindOf(st)}, not a folder`, `give ${option} a folder (it is made if it does not exist)`);
    writable(dir, option);
    return;
  }
  // The nearest ancestor that exists must be a writable folder.
  let up = resolve(dir);
  for (;;) {
    const parent = dirname(up);
    if (parent === up) break;
    up = parent;
    try {
      const s = statSync(up);
      if (!s.isDirectory()) throw new ModelError(option, `${dir}: ${up} is ${kindOf(s)}, not a folder`, 'give a folder path');
      writable(up, option, dir);
      return;
    } catch (e) {
      if (e instanceof ModelError) throw e;
      const code = (e as { code?: string }).code;
      if (code !== 'ENOENT') throw new ModelError(option, `${dir}: ${up} cannot be used (${code ?? (e as Error).message})`, 'choose another folder');
    }
  }
}

function writable(folder: string, option: string, wanted?: string): void {
  try {
    accessSync(folder, constants.W_OK | constants.X_OK);
  } catch {
    throw new ModelError(option, `${wanted ? `${wanted}: the folder ${folder} it would be made in` : folder} is not writable`, 'choose a folder you may write to, or change its permissions');
  }
}

/** Makes dir and its missing parents, one level at a time; a ModelError naming the level that fails. */
export function makeOutputDir(dir: string, option = '-o'): void {
  const missing: string[] = [];
  let p = resolve(dir);
  for (;;) {
    try {
      if (statSync(p).isDirectory()) break;
      throw new ModelError(option, `${dir}: ${p} is not a folder`, 'give a folder path');
    } catch (e) {
      if (e instanceof ModelError) throw e;
      missing.push(p);
      const parent = dirname(p);
      if (parent === p) break;
      p = parent;
    }
  }
  for (const m of missing.reverse()) {
    try {
      mkdirSync(m);
    } catch (e) {
      const code = (e as { code?: string }).code;
      if (code === 'EEXIST' && statSync(m).isDirectory()) continue;
      throw new ModelError(option, `${dir}: the folder ${m} cannot be made (${code ?? (e as Error).message})`, 'choose a folder on a writable disk');
    }
  }
}

interface LockOwner {
  pid: number;
  host: string;
  started: string;
  command: string;
}

/** True when a process with this pid runs on this host (EPERM: it runs, as another user). */
export function processAlive(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as { code?: string }).code === 'EPERM';
  }
}

function readOwner(path: string): LockOwner | undefined {
  try {
    const o = JSON.parse(readFileSync(path, 'utf8')) as Partial<LockOwner>;
    if (typeof o.pid === 'number' && typeof o.host === 'string') return { pid: o.pid, host: o.host, started: String(o.started ?? '?'), command: String(o.command ?? '?') };
  } catch {
    // unreadable or half-written: treated as no owner below
  }
  return undefined;
}

const held = new Set<string>();
let exitHook = false;

/**
 * Locks dir (which must exist) for this process until it exits or releaseOutputLock is called.
 * Throws a ModelError naming the owner when another live run holds it.
 */
export function lockOutputDir(dir: string, option = '-o'): void {
  const path = join(resolve(dir), LOCK_FILE);
  if (held.has(path)) return;
  const me: LockOwner = { pid: process.pid, host: hostname(), started: new Date().toISOString(), command: process.argv.slice(1).join(' ').slice(0, 300) };
  for (let attempt = 0; attempt < 3; attempt++) {
    let fd: number;
    try {
      fd = openSync(path, constants.O_WRONLY | constants.O_CREAT | constants.O_EXCL, 0o644);
    } catch (e) {
      const code = (e as { code?: string }).code;
      if (code !== 'EEXIST') throw new ModelError(option, `${dir}: the lock file ${path} cannot be made (${code ?? (e as Error).message})`, 'choose a folder you may write to');
      const owner = readOwner(path);
      let age = Infinity;
      try {
        age = Date.now() - lstatSync(path).mtimeMs;
      } catch {
        continue; // removed meanwhile: try again
      }
      // A lock being written this instant has no owner yet: give it a moment before calling it stale.
      if (!owner && age < 2000) {
        throw new ModelError(option, `the output folder ${dir} is being locked by another raiser run at this moment`, `wait for it to finish, or choose another folder with ${option}`);
      }
      if (owner && (owner.host !== me.host || processAlive(owner.pid))) {
        throw new ModelError(
          option,
          `the output folder ${dir} is in use by another raiser run: pid ${owner.pid} on ${owner.host}, started ${owner.started} (${owner.command})`,
          `wait for it to finish, or choose another folder with ${option}; if that run is gone${owner.host !== me.host ? ' (it ran on another machine)' : ''}, remove ${path}`,
        );
      }
      // Stale: its owner has ended. Take it over.
      rmSync(path, { force: true });
      continue;
    }
    try {
      writeSync(fd, JSON.stringify(me) + '\n');
    } finally {
      closeSync(fd);
    }
    held.add(path);
    if (!exitHook) {
      exitHook = true;
      process.on('exit', () => {
        for (const p of held) releaseLockFile(p);
      });
    }
    return;
  }
  throw new ModelError(option, `the output folder ${dir} could not be locked`, 'try again, or choose another folder');
}

function releaseLockFile(path: string): void {
  const owner = readOwner(path);
  if (owner && owner.pid === process.pid && owner.host === hostname()) rmSync(path, { force: true });
  held.delete(path);
}

/** Releases this process's lock on dir, if it holds one. */
export function releaseOutputLock(dir: string): void {
  const path = join(resolve(dir), LOCK_FILE);
  if (held.has(path)) releaseLockFile(path);
}
