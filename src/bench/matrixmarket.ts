/**
 * Bench row: reading a large Matrix Market file (src/solve/matrixmarket.ts), bytes from disk to
 * the compressed lower triangle, in MB/s (1 MB = 10^6 bytes). The file is written once to the
 * system's temporary folder and deleted after: the stiffness matrix of the 6-node plane-stress
 * cantilever fixture (about 1e5 DOF, values printed as raiser writes them, the shortest text
 * that reads back exactly: mostly 16-17 significant digits) repeated as diagonal blocks until
 * the file holds about `megabytes` MB (a block-diagonal matrix of such blocks is still
 * symmetric positive definite).
 *
 *   npx tsc -p tsconfig.build.json && node dist/bench/matrixmarket.js [--mb 200] [--runs 3]
 */
import { closeSync, mkdtempSync, openSync, readFileSync, rmSync, statSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { cantileverProblemP2 } from './fixtures/cantilever-p2.js';
import { readMatrixMarket } from '../solve/matrixmarket.js';
import { median } from './stats.js';

/** The reading speed the bench row asks for, MB/s. */
const TARGET_MB_PER_S = 100;

/** Writes the block-diagonal file of about `megabytes` MB; returns its order and entry count. */
function writeBlockFile(path: string, megabytes: number): { n: number; entries: number } {
  const a = cantileverProblemP2(80, 40, 7).matrix;
  // the lines of one block, 0-based indices, so each copy only shifts them
  const lines: { i: number; j: number; v: string }[] = [];
  let blockBytes = 0;
  for (let j = 0; j < a.n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      const v = String(a.values[p]);
      lines.push({ i: a.rowIndex[p], j, v });
      blockBytes += v.length + 2 * String(a.n).length + 3;
    }
  }
  const blocks = Math.max(1, Math.round((megabytes * 1e6) / blockBytes));
  const n = blocks * a.n;
  const entries = blocks * lines.length;
  const fd = openSync(path, 'w');
  try {
    writeSync(fd, `%%MatrixMarket matrix coordinate real symmetric\n% bench file: ${blocks} diagonal blocks of a 6-node plane-stress cantilever stiffness (an invented test matrix)\n${n} ${n} ${entries}\n`);
    for (let b = 0; b < blocks; b++) {
      const off = b * a.n + 1;
      let chunk = '';
      for (const l of lines) {
        chunk += `${l.i + off} ${l.j + off} ${l.v}\n`;
        if (chunk.length > 1 << 20) {
          writeSync(fd, chunk);
          chunk = '';
        }
      }
      writeSync(fd, chunk);
    }
  } finally {
    closeSync(fd);
  }
  return { n, entries };
}


/** Writes the file, reads it `runs` times after one warm-up read, prints the row, deletes the file. */
export function runMatrixMarketBench(log: (s: string) => void, megabytes = 200, runs = 3): void {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-mtx-'));
  try {
    const file = join(dir, 'K.mtx');
    const { n, entries } = writeBlockFile(file, megabytes);
    const bytes = statSync(file).size;
    const reads: number[] = [];
    const parses: number[] = [];
    let nnz = 0;
    for (let r = 0; r <= runs; r++) {
      const t0 = performance.now();
      const bytesRead = readFileSync(file);
      const t1 = performance.now();
      const a = readMatrixMarket(bytesRead);
      const t2 = performance.now();
      nnz = a.colPtr[a.n];
      // the first read warms the engine and the file cache
      if (r > 0) {
        reads.push((t1 - t0) / 1e3);
        parses.push((t2 - t1) / 1e3);
      }
    }
    const totals = reads.map((t, k) => t + parses[k]);
    const rates = totals.map((t) => bytes / 1e6 / t);
    const parseRate = bytes / 1e6 / median(parses);
    log('| file MB | order n | entries | read file | parse + compress | total | MB/s (total) median | min ... max | MB/s parse only | target |');
    log('|---|---|---|---|---|---|---|---|---|---|');
    log(
      `| ${(bytes / 1e6).toFixed(0)} | ${n} | ${entries} | ${median(reads).toFixed(2)} s | ${median(parses).toFixed(2)} s | ${median(totals).toFixed(2)} s | ${median(rates).toFixed(0)} | ${Math.min(...rates).toFixed(0)} ... ${Math.max(...rates).toFixed(0)} | ${parseRate.toFixed(0)} | >= ${TARGET_MB_PER_S} MB/s from disk to matrix: ${median(rates) >= TARGET_MB_PER_S ? 'met' : 'NOT met'} |`,
    );
    if (nnz !== entries) throw new Error(`Matrix Market bench: read ${nnz} entries of ${entries}`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const arg = (name: string, dflt: number) => {
    const k = process.argv.indexOf(name);
    return k > 0 ? Number(process.argv[k + 1]) : dflt;
  };
  runMatrixMarketBench(console.log, arg('--mb', 200), arg('--runs', 3));
}
