/**
 * A run killed while it writes its results leaves no half-written file under a final name and
 * no result.json (the mark of a finished set, written last); the next run into the same folder
 * removes the temporary files and completes. Kills are SIGKILL, which no handler can catch.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { raiser, ROOT } from './support/cli.js';

const BIN = fileURLToPath(new URL('../dist/cli/raiser.js', import.meta.url));
const MODEL = 'examples/strap-bolt-hole.json';

/** Starts a solve into `dir` and kills it as soon as the folder holds `after` files. */
function killWhileWriting(dir: string, after: number): Promise<string[]> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BIN, 'solve', MODEL, '--single-mesh', '-o', dir, '--force'], { cwd: ROOT, stdio: 'ignore' });
    const timer = setInterval(() => {
      // The run's lock file is there from the start: count result files only.
      const files = existsSync(dir) ? readdirSync(dir).filter((f) => f !== '.raiser-lock') : [];
      if (files.length >= after) {
        child.kill('SIGKILL');
        clearInterval(timer);
      }
    }, 1);
    child.on('error', reject);
    child.on('exit', () => {
      clearInterval(timer);
      resolve(readdirSync(dir));
    });
  });
}

function checkComplete(dir: string, files: string[]): void {
  if (files.includes('nodes.csv')) {
    const lines = readFileSync(join(dir, 'nodes.csv'), 'utf8').split('\n');
    expect(lines.at(-1)).toBe('');
    const width = lines[0].split(',').length;
    for (const l of lines.slice(1, -1)) expect(l.split(',').length).toBe(width);
  }
  if (files.includes('result.json')) {
    // Only a finished run writes it, and then every other file is complete too.
    JSON.parse(readFileSync(join(dir, 'result.json'), 'utf8'));
    expect(files.filter((f) => f.includes('.raiser-tmp-'))).toEqual([]);
  }
  for (const f of files.filter((n) => n.endsWith('.png'))) {
    const png = readFileSync(join(dir, f));
    expect(png.subarray(1, 4).toString()).toBe('PNG');
    expect(png.subarray(-8, -4).toString()).toBe('IEND');
  }
  for (const f of files.filter((n) => n.endsWith('.svg') || n.endsWith('.html') || n.endsWith('.vtu'))) {
    const text = readFileSync(join(dir, f), 'utf8').trimEnd();
    expect(text.endsWith('>'), `${f} ends with a closing tag`).toBe(true);
  }
}

describe('a run killed while writing', () => {
  it('leaves only complete files, and the next run cleans up and finishes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-kill-'));
    // Kill at several points of the writing: after the first file appears, after a few, after more.
    for (const after of [1, 3, 6]) {
      const files = await killWhileWriting(dir, after);
      if (process.env.RAISER_DEBUG_KILL) console.log(after, files);
      checkComplete(dir, files);
    }
    const r = raiser(['solve', MODEL, '--single-mesh', '-o', dir, '--force']);
    expect(r.code, r.stderr).toBe(0);
    const files = readdirSync(dir);
    expect(files).toContain('result.json');
    expect(files.filter((f) => f.includes('.raiser-tmp-'))).toEqual([]);
    // The killed runs' locks were stale and taken over; the finished run released its own.
    expect(files).not.toContain('.raiser-lock');
    checkComplete(dir, files);
  });
});
