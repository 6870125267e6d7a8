/**
 * Benchmark of the sparse direct solver on plane-stress stiffness matrices of
 * linear (3-node, constant strain) and quadratic (6-node, linear strain)
 * triangles on a jittered triangulated 2 x 1 rectangle with its left edge
 * fixed: the matrices of the native reference in shared/MEASURED.md, whose
 * CHOLMOD-with-AMD totals (ordering + factorisation + solve) are printed
 * beside each row with the ratio ours / reference.
 *
 *   npx tsc -p tsconfig.build.json && node dist/bench/solve.js [--large] [--amd] [--runs N] [--elements linear,quadratic]
 *
 * --large adds the 5e5 and 1e6 DOF cases; --amd also times the AMD ordering
 * (the default is nested dissection from the node coordinates); --sizes
 * a,b,c picks the DOF counts; --elements picks the element types (default both). Each case first runs warm-up solves (10 below
 * 2e4 DOF, 3 below 2e5, else 1: the JavaScript engine needs several calls
 * before the small cases reach their compiled speed), then `runs` timed
 * solves (default 3); the table has the medians, "best" the fastest timed
 * total (this machine's speed varies with its neighbours' load), and "cold"
 * the total time of the very first solve of that case.
 */

import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { cantileverProblem } from './fixtures/cantilever.js';
import { cantileverProblemP2 } from './fixtures/cantilever-p2.js';
import { backwardError, SolverThreads, solveSpd, type OrderingMethod, type SolveStats } from '../solve/index.js';
import { peakResidentBytes } from './memory.js';
import { median } from './stats.js';

export type BenchElement = 'linear' | 'quadratic';

/**
 * CHOLMOD called directly with its AMD ordering, ordering + factorisation + solve in seconds,
 * linear / quadratic, on this machine (shared/MEASURED.md, second table, "with AMD, total").
 */
const CHOLMOD_AMD_SECONDS: ReadonlyArray<{ dof: number; linear: number; quadratic: number }> = [
  { dof: 1e4, linear: 0.018, quadratic: 0.028 },
  { dof: 1e5, linear: 0.32, quadratic: 0.37 },
  { dof: 5e5, linear: 2.3, quadratic: 2.8 },
  { dof: 1e6, linear: 4.9, quadratic: 6.1 },
  { dof: 2e6, linear: 12.5, quadratic: 13.2 },
];

/** The reference time at the listed size within 15 % of dof, or NaN. */
function cholmodReference(dof: number, element: BenchElement): number {
  const r = CHOLMOD_AMD_SECONDS.find((x) => Math.abs(x.dof - dof) <= 0.15 * x.dof);
  return r === undefined ? NaN : r[element];
}

/** The cantilever benchmark problem of about `target` DOF with 3- or 6-node triangles. */
function benchProblem(target: number, element: BenchElement) {
  // 2:1 rectangle, nx = 2 ny cells: about 4 ny^2 DOF (linear), 16 ny^2 (quadratic)
  const ny = Math.max(2, Math.round(Math.sqrt(target / (element === 'linear' ? 4 : 16))));
  return element === 'linear' ? cantileverProblem(2 * ny, ny, 7) : cantileverProblemP2(2 * ny, ny, 7);
}

export interface SolveBenchRow {
  readonly dof: number;
  readonly element: BenchElement;
  /** CHOLMOD with AMD on this machine at this size (NaN when not measured) */
  readonly referenceSeconds: number;
  readonly ordering: OrderingMethod;
  readonly nnzA: number;
  readonly nnzL: number;
  readonly flops: number;
  readonly seconds: { ordering: number; symbolic: number; numeric: number; solve: number; total: number; bestTotal: number };
  readonly gflops: number;
  readonly bytesPerNnzL: number;
  readonly peakRssBytes: number;
  readonly relativeResidual: number;
  /** normwise backward error ||b - A x|| / (||A|| ||x|| + ||b||), infinity norm, of the last run */
  readonly backwardError: number;
  readonly assemblySeconds: number;
  /** total seconds of the first (cold) solve of this case */
  readonly coldSeconds: number;
  /** threads of the numeric factorisation */
  readonly threads: number;
}

export interface SolveBenchOptions {
  /** approximate DOF counts to run */
  readonly sizes?: readonly number[];
  readonly orderings?: readonly OrderingMethod[];
  readonly elements?: readonly BenchElement[];
  readonly runs?: number;
  readonly log?: (line: string) => void;
}


/** Runs the benchmark and returns one row per (size, ordering); prints the table through log. */
export function runSolveBench(options: SolveBenchOptions = {}): SolveBenchRow[] {
  const sizes = options.sizes ?? [1e4, 1e5];
  const orderings = options.orderings ?? ['nested-dissection'];
  const elements = options.elements ?? ['linear', 'quadratic'];
  const runs = options.runs ?? 3;
  const log = options.log ?? ((line: string) => console.log(line));
  const out: SolveBenchRow[] = [];
  // one second thread for the whole bench, as an analysis keeps one for its solves
  const workers = new SolverThreads();
  try {
    benchCases(sizes, orderings, elements, runs, log, workers, out);
  } finally {
    workers.close();
  }
  return out;
}

function benchCases(
  sizes: readonly number[],
  orderings: readonly OrderingMethod[],
  elements: readonly BenchElement[],
  runs: number,
  log: (line: string) => void,
  workers: SolverThreads,
  out: SolveBenchRow[],
): void {
  log(`node ${process.version}, ${runs} timed runs after warm-up; times in seconds (medians); peak RSS is the process's so far`);
  log(
    '| element | DOF | ordering | nnz(A) | nnz(L) | flops | order | symbolic | numeric | solve | total | best | cold | CHOLMOD AMD | ratio | GFLOP/s | bytes/nnz(L) | peak RSS | rel. residual | backward error |',
  );
  log('|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|');
  for (const target of sizes) for (const element of elements) {
    const tA = performance.now();
    const prob = benchProblem(target, element);
    const assemblySeconds = (performance.now() - tA) / 1e3;
    const n = prob.matrix.n;
    const b = new Float64Array(n);
    // unit downward load on the free end: every y DOF of the nodes at x = 2
    for (let r = 0; r < n; r++) {
      const d = prob.fullDofOfRow[r];
      const v = d >> 1;
      if (d % 2 === 1 && prob.mesh.coords[2 * v] === 2) b[r] = -1;
    }
    for (const ordering of orderings) {
      const samples: SolveStats[] = [];
      const warmups = n < 2e4 ? 10 : n < 2e5 ? 3 : 1;
      let coldSeconds = 0;
      let eta = NaN;
      for (let run = 0; run < warmups + runs; run++) {
        const { stats, x } = solveSpd(prob.matrix, b, {
          coords: prob.mesh.coords,
          nodeAdjacency: prob.adjacency,
          dofsPerNode: 2,
          fullDofOfRow: prob.fullDofOfRow,
          ordering,
          workers,
        });
        if (run === 0) coldSeconds = stats.seconds.ordering + stats.seconds.symbolic + stats.seconds.numeric + stats.seconds.solve;
        if (run >= warmups) samples.push(stats);
        if (run === warmups + runs - 1) eta = backwardError(prob.matrix, x, b);
      }
      const s0 = samples[0];
      const sec = {
        ordering: median(samples.map((s) => s.seconds.ordering)),
        symbolic: median(samples.map((s) => s.seconds.symbolic)),
        numeric: median(samples.map((s) => s.seconds.numeric)),
        solve: median(samples.map((s) => s.seconds.solve)),
        total: median(samples.map((s) => s.seconds.ordering + s.seconds.symbolic + s.seconds.numeric + s.seconds.solve)),
        bestTotal: Math.min(...samples.map((s) => s.seconds.ordering + s.seconds.symbolic + s.seconds.numeric + s.seconds.solve)),
      };
      const referenceSeconds = cholmodReference(n, element);
      const row: SolveBenchRow = {
        dof: n,
        element,
        referenceSeconds,
        ordering,
        nnzA: s0.nnzA,
        nnzL: s0.nnzL,
        flops: s0.flops,
        seconds: sec,
        gflops: s0.flops / sec.numeric / 1e9,
        bytesPerNnzL: s0.bytesPerNnzL,
        peakRssBytes: peakResidentBytes(),
        relativeResidual: Math.max(...samples.map((s) => s.relativeResidual)),
        backwardError: eta,
        assemblySeconds,
        coldSeconds,
        threads: s0.threads,
      };
      out.push(row);
      const e = (x: number): string => x.toExponential(2);
      const f = (x: number): string => x.toFixed(3);
      log(
        `| ${element === 'linear' ? '3-node' : '6-node'} | ${n} | ${ordering}${s0.threads > 1 ? ` (${s0.threads} threads)` : ''} | ${e(row.nnzA)} | ${e(row.nnzL)} | ${e(row.flops)} | ${f(sec.ordering)} | ${f(sec.symbolic)} | ${f(sec.numeric)} | ${f(sec.solve)} | ${f(sec.total)} | ${f(sec.bestTotal)} | ${f(coldSeconds)} | ${Number.isNaN(referenceSeconds) ? '-' : f(referenceSeconds)} | ${Number.isNaN(referenceSeconds) ? '-' : (sec.total / referenceSeconds).toFixed(2)} | ${row.gflops.toFixed(2)} | ${row.bytesPerNnzL.toFixed(1)} | ${(row.peakRssBytes / 2 ** 30).toFixed(2)} GB | ${e(row.relativeResidual)} | ${e(row.backwardError)} |`,
      );
    }
  }
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  const args = process.argv.slice(2);
  const large = args.includes('--large');
  const runsAt = args.indexOf('--runs');
  const runs = runsAt >= 0 ? Number(args[runsAt + 1]) : 3;
  const sizesAt = args.indexOf('--sizes');
  const sizes = sizesAt >= 0 ? args[sizesAt + 1].split(',').map(Number) : large ? [1e4, 1e5, 5e5, 1e6] : [1e4, 1e5];
  const orderings: OrderingMethod[] = args.includes('--amd') ? ['nested-dissection', 'amd'] : ['nested-dissection'];
  const elAt = args.indexOf('--elements');
  const elements = elAt >= 0 ? (args[elAt + 1].split(',') as BenchElement[]) : undefined;
  runSolveBench({ sizes, orderings, runs, elements });
}
