/**
 * Reading a file that someone else may have made: only a regular file, only up to a size
 * limit, and without blocking. A path may name a FIFO (reading it would wait forever), a device
 * (/dev/zero never ends), or a symbolic link to either; it may grow while it is read. The file
 * is opened without blocking, checked through its open descriptor (so the check and the read
 * see the same file), and read to at most the limit plus one byte.
 */
import { closeSync, constants, fstatSync, openSync, readSync } from 'node:fs';

export type ReadRefusal =
  | { kind: 'missing' }
  | { kind: 'folder' }
  | { kind: 'not-regular'; what: string }
  | { kind: 'too-large'; bytes: number }
  | { kind: 'unreadable'; reason: string };

export type ReadOutcome = { ok: true; bytes: Buffer } | ({ ok: false } & ReadRefusal);

/** What a file that is not a regular file is, in words. */
function kindOf(st: ReturnType<typeof fstatSync>): string {
  if (st.isFIFO()) return 'a named pipe (FIFO)';
  if (st.isCharacterDevice()) return 'a character device';
  if (st.isBlockDevice()) return 'a block device';
  if (st.isSocket()) return 'a socket';
  return 'not a regular file';
}

/** Reads a regular file of at most maxBytes; never blocks on a pipe or reads past the limit. */
export function readRegularFile(path: string, maxBytes: number): ReadOutcome {
  let fd: number;
  try {
    fd = openSync(path, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    const code = (e as { code?: string }).code;
    if (code === 'ENOENT' || code === 'ENOTDIR') return { ok: false, kind: 'missing' };
    if (code === 'EISDIR') return { ok: false, kind: 'folder' };
    if (code === 'ENXIO') return { ok: false, kind: 'not-regular', what: 'a named pipe (FIFO) or socket' };
    return { ok: false, kind: 'unreadable', reason: code === 'EACCES' || code === 'EPERM' ? 'permission denied' : (e as Error).message };
  }
  try {
    const st = fstatSync(fd);
    if (st.isDirectory()) return { ok: false, kind: 'folder' };
    if (!st.isFile()) return { ok: false, kind: 'not-regular', what: kindOf(st) };
    if (st.size > maxBytes) return { ok: false, kind: 'too-large', bytes: st.size };
    // The size may change under us: read at most one byte beyond the size found.
    const buf = Buffer.allocUnsafe(st.size + 1);
    let got = 0;
    for (;;) {
      if (got === buf.length) break;
      let n: number;
      try {
        n = readSync(fd, buf, got, buf.length - got, null);
      } catch (e) {
        if ((e as { code?: string }).code === 'EAGAIN') break;
        return { ok: false, kind: 'unreadable', reason: (e as Error).message };
      }
      if (n === 0) break;
      got += n;
    }
    if (got > st.size) return { ok: false, kind: 'unreadable', reason: 'it grew while it was being read' };
    return { ok: true, bytes: buf.subarray(0, got) };
  } finally {
    closeSync(fd);
  }
}

/** A byte count in words: "64 MiB", "1.5 GiB". */
export function formatBytes(n: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
  let v = n;
  let k = 0;
  while (v >= 1024 && k < units.length - 1) {
    v /= 1024;
    k++;
  }
  return k === 0 ? `${n} bytes` : `${Number(v.toPrecision(3))} ${units[k]}`;
}
