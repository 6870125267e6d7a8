/**
 * `raiser bench-solve K.mtx [b.mtx]`: factors and solves a symmetric positive definite Matrix
 * Market file with raiser's sparse solver and prints the figures of the solver benchmark
 * (ordering, symbolic, numeric and solve times, nnz(L), flops, GFLOP/s, bytes per nnz(L), peak
 * memory, relative residual), so the solver can be compared with any other on the same matrix.
 * Without b the right-hand side is b = A * ones (so the exact solution is all ones).
 */
import { readFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { Option, type Command } from 'commander';
import { ModelError } from '../model/errors.js';
import { peakResidentBytes } from '../bench/memory.js';
import {
  backwardError,
  multiplySymmetric,
  readMatrixMarket,
  readMatrixMarketArray,
  solveSpd,
  type OrderingMethod,
  type SolveStats,
  type SymmetricCsc,
} from '../solve/index.js';

export interface BenchSolveFlags {
  ordering?: 'amd' | 'natural';
  runs?: string;
  threads?: string;
  method?: 'auto' | 'cholesky' | 'pcg';
  json?: boolean;
}

/** The file's bytes: the Matrix Market reader parses them without decoding the whole text. */
function readText(file: string, what: string): Uint8Array {
  try {
    return readFileSync(file);
  } catch (err) {
    throw new ModelError(what, `cannot read ${file}: ${(err as Error).message}`, 'give the path of a Matrix Market file');
  }
}

function parseMatrix(file: string): SymmetricCsc {
  try {
    return readMatrixMarket(readText(file, 'K.mtx'));
  } catch (err) {
    if (err instanceof ModelError) throw err;
    throw new ModelError('K.mtx', `${file}: ${(err as Error).message}`, 'write the matrix as "%%MatrixMarket matrix coordinate real symmetric" (or general, if symmetric)');
  }
}

function parseVector(file: string, n: number): Float64Array {
  let v;
  try {
    v = readMatrixMarketArray(readText(file, 'b.mtx'));
  } catch (err) {
    if (err instanceof ModelError) throw err;
    throw new ModelError('b.mtx', `${file}: ${(err as Error).message}`, 'write b as "%%MatrixMarket matrix array real general"');
  }
  if (v.rows !== n) throw new ModelError('b.mtx', `${file} has ${v.rows} rows, the matrix has order ${n}`, 'give a right-hand side of the same order as the matrix');
  return v.values;
}

/** The printed report of one bench-solve run. */
function formatBenchSolve(file: string, a: SymmetricCsc, stats: SolveStats, times: { read: number; total: number; best: number }, runs: number, peakRssBytes: number, backwardErr = NaN): string {
  const s = stats.seconds;
  const e = (x: number): string => x.toExponential(3);
  const sec = (x: number): string => `${x.toFixed(3)} s`;
  const lines = [
    `raiser bench-solve: ${file}`,
    `  node ${process.version}, ${process.platform} ${process.arch}; ${runs} run${runs > 1 ? 's' : ''}, medians`,
    `  order n           ${a.n}`,
    `  nnz(A)            ${stats.nnzA} (full symmetric)`,
    `  read              ${sec(times.read)}`,
    `  method            ${stats.method === 'pcg' ? 'preconditioned conjugate gradient' : 'sparse Cholesky'}, ordering ${stats.ordering}`,
    `  ordering          ${sec(s.ordering)}`,
    `  symbolic          ${sec(s.symbolic)}`,
  ];
  if (stats.method === 'cholesky') {
    lines.push(
      `  numeric           ${sec(s.numeric)}  (${stats.threads} thread${stats.threads > 1 ? 's' : ''})`,
      `  solve             ${sec(s.solve)}${stats.refinementSteps > 0 ? `  (with ${stats.refinementSteps} step${stats.refinementSteps > 1 ? 's' : ''} of iterative refinement)` : ''}`,
      `  total             ${sec(times.total)}  (best ${sec(times.best)})`,
      `  nnz(L)            ${stats.nnzL} (${e(stats.nnzL)})`,
      `  flops             ${e(stats.flops)}`,
      `  GFLOP/s           ${s.numeric > 0 ? (stats.flops / s.numeric / 1e9).toFixed(2) : '-'}`,
      `  bytes/nnz(L)      ${stats.bytesPerNnzL.toFixed(1)}  (factor ${(stats.factorBytes / 2 ** 20).toFixed(1)} MB)`,
    );
  } else {
    lines.push(
      `  preconditioner    ${sec(s.numeric)}  (${stats.preconditioner})`,
      `  iterations        ${stats.iterations} in ${sec(s.solve)}`,
      `  total             ${sec(times.total)}  (best ${sec(times.best)})`,
      `  nnz(L) direct     ${stats.nnzL} (${e(stats.nnzL)}), estimated factor ${(stats.estimatedFactorBytes / 2 ** 20).toFixed(1)} MB, limit ${(stats.maxFactorBytes / 2 ** 20).toFixed(1)} MB`,
    );
  }
  lines.push(`  peak RSS          ${(peakRssBytes / 2 ** 30).toFixed(2)} GB`, `  residual          ${e(stats.relativeResidual)}  (||Ax - b|| / ||b||)`);
  if (!Number.isNaN(backwardErr)) lines.push(`  backward error    ${e(backwardErr)}  (||Ax - b|| / (||A|| ||x|| + ||b||), infinity norm)`);
  return lines.join('\n');
}

function median(xs: number[]): number {
  const s = xs.slice().sort((p, q) => p - q);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

function runBenchSolve(file: string, bFile: string | undefined, flags: BenchSolveFlags): number {
  const runs = flags.runs === undefined ? 1 : Number(flags.runs);
  if (!Number.isInteger(runs) || runs < 1 || runs > 100) throw new ModelError('--runs', `"${flags.runs}" is not a run count`, 'write --runs 3 (1 to 100)');
  const threads = flags.threads === undefined ? 2 : Number(flags.threads);
  if (threads !== 1 && threads !== 2) throw new ModelError('--threads', `"${flags.threads}" is not 1 or 2`, 'write --threads 1 or --threads 2');
  const t0 = performance.now();
  const a = parseMatrix(file);
  let b: Float64Array;
  if (bFile !== undefined) b = parseVector(bFile, a.n);
  else {
    b = new Float64Array(a.n);
    multiplySymmetric(a, new Float64Array(a.n).fill(1), b);
  }
  const read = (performance.now() - t0) / 1e3;
  const ordering: OrderingMethod = flags.ordering ?? 'amd';
  const method = flags.method ?? 'auto';
  const samples: SolveStats[] = [];
  let eta = NaN;
  for (let r = 0; r < runs; r++) {
    const { stats, x } = solveSpd(a, b, {
      ordering,
      threads: threads as 1 | 2,
      method,
    });
    samples.push(stats);
    if (r === runs - 1) eta = backwardError(a, x, b);
  }
  const total = (s: SolveStats): number => s.seconds.ordering + s.seconds.symbolic + s.seconds.numeric + s.seconds.solve;
  const mid = samples.slice().sort((p, q) => total(p) - total(q))[(samples.length - 1) >> 1];
  const stats: SolveStats = {
    ...mid,
    seconds: {
      ordering: median(samples.map((s) => s.seconds.ordering)),
      symbolic: median(samples.map((s) => s.seconds.symbolic)),
      numeric: median(samples.map((s) => s.seconds.numeric)),
      solve: median(samples.map((s) => s.seconds.solve)),
    },
    relativeResidual: Math.max(...samples.map((s) => s.relativeResidual)),
  };
  const times = { read, total: median(samples.map(total)), best: Math.min(...samples.map(total)) };
  const peak = peakResidentBytes();
  if (flags.json) {
    process.stdout.write(JSON.stringify({ file, n: a.n, runs, times, peakRssBytes: peak, backwardError: eta, stats }, null, 2) + '\n');
  } else {
    process.stdout.write(formatBenchSolve(file, a, stats, times, runs, peak, eta) + '\n');
  }
  return 0;
}

/** Registers `raiser bench-solve`. */
export function declareBenchSolve(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .argument('<K.mtx>', 'the matrix (Matrix Market coordinate, symmetric or general)')
    .argument('[b.mtx]', 'the right-hand side (Matrix Market array); default b = A * ones')
    .addOption(new Option('--ordering <method>', 'fill-reducing ordering (default amd)').choices(['amd', 'natural']))
    .addOption(new Option('--method <method>', 'direct, iterative, or chosen by the factor memory (default auto)').choices(['auto', 'cholesky', 'pcg']))
    .option('--runs <n>', 'timed runs; the medians are printed (default 1)')
    .option('--threads <n>', '1 or 2 threads for the factorisation (default 2)')
    .option('--json', 'print the figures as one JSON object')
    .action((file: string, bFile: string | undefined, flags: BenchSolveFlags) => {
      setCode(runBenchSolve(file, bFile, flags));
    });
}
