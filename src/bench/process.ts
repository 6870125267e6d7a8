/**
 * Whole-process times: what a user waits for from the shell, start-up included. Each command is
 * run as a new process several times (after one untimed run that warms the disk cache); the
 * table gives the median, the spread (least and greatest) and the target where the issue sets
 * one. Node's own start (`node -e 0`) is timed in the same run as the floor the others stand on.
 *
 *   node dist/bench/process.js [--runs 7]
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import { median } from './stats.js';

const CLI = fileURLToPath(new URL('../cli/raiser.js', import.meta.url));
const STRAP = fileURLToPath(new URL('../../examples/strap-bolt-hole.json', import.meta.url));

interface ProcessRow {
  label: string;
  args: string[];
  /** seconds; undefined where the issue sets none */
  target?: number;
  /** a fresh output folder per run */
  out?: boolean;
}

const ROWS: ProcessRow[] = [
  { label: 'node -e 0 (Node\'s own start, the floor)', args: ['-e', '0'] },
  { label: 'raiser --version', args: [CLI, '--version'], target: 0.15 },
  { label: 'raiser --help', args: [CLI, '--help'], target: 0.15 },
  { label: 'raiser solve examples/strap-bolt-hole.json (certified Kt, 1%)', args: [CLI, 'solve', STRAP], target: 1.0 },
  { label: 'raiser solve examples/strap-bolt-hole.json -o DIR (with pictures and report)', args: [CLI, 'solve', STRAP], out: true },
];


/** Seconds of one run of `node args`; throws when the command fails. */
function timeOnce(row: ProcessRow): number {
  const dir = row.out ? mkdtempSync(join(tmpdir(), 'raiser-bench-')) : undefined;
  const args = dir ? [...row.args, '-o', join(dir, 'out')] : row.args;
  const t0 = performance.now();
  const r = spawnSync(process.execPath, args, { stdio: ['ignore', 'ignore', 'pipe'] });
  const s = (performance.now() - t0) / 1e3;
  if (dir) rmSync(dir, { recursive: true, force: true });
  if (r.status !== 0) throw new Error(`${row.label} exited with ${r.status}: ${r.stderr.toString().slice(0, 400)}`);
  return s;
}

/** The whole-process table; the runs of all rows are interleaved so that a change of load hits every row alike. */
export function runProcessBench(log: (s: string) => void, runs = 7): void {
  log(`| command | median | spread (least - greatest) | runs | target | met |`);
  log('|---|---|---|---|---|---|');
  for (const row of ROWS) timeOnce(row); // warm the disk cache
  const times = ROWS.map(() => [] as number[]);
  for (let r = 0; r < runs; r++) ROWS.forEach((row, i) => times[i].push(timeOnce(row)));
  ROWS.forEach((row, i) => {
    const m = median(times[i]);
    const met = row.target === undefined ? '' : m <= row.target ? 'yes' : 'NO';
    log(`| ${row.label} | ${m.toFixed(3)} s | ${Math.min(...times[i]).toFixed(3)} - ${Math.max(...times[i]).toFixed(3)} s | ${runs} | ${row.target === undefined ? '-' : `< ${row.target} s`} | ${met} |`);
  });
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  const i = process.argv.indexOf('--runs');
  runProcessBench(console.log, i > 0 ? Number(process.argv[i + 1]) : 7);
}
