/**
 * Triangular solves with a supernodal factor: x = P^T L^-T L^-1 P b, forward then backward
 * substitution over the supernodes (kernels in multifrontal.ts). A factor made on two threads
 * is solved on two when the caller lends its second thread (threads.ts).
 */

import type { CholeskyFactor } from './numeric.js';
import { backwardRange, forwardRange } from './multifrontal.js';
import type { SolverThreads } from './threads.js';

/**
 * Solves A x = b with the factor of A(p, p) = L L^T: x = P^T L^-T L^-1 P b.
 * b holds nrhs right-hand sides of length n one after another; the result
 * has the same layout. b is not modified.
 */
export function solveCholesky(factor: CholeskyFactor, b: Float64Array, nrhs = 1, options: SolveCholeskyOptions = {}): Float64Array {
  const sym = factor.symbolic;
  const { n, perm } = sym;
  if (b.length !== n * nrhs) throw new RangeError(`solveCholesky: right-hand side length ${b.length}, expected ${n * nrhs}`);
  const x = new Float64Array(n * nrhs);
  const { nSuper, superStart, rowPtr, superRows, valuePtr } = sym;
  const L = factor.values;
  const t = new Float64Array(Math.max(1, sym.maxFront));
  // With a factor split over two threads, the worker's subtree is solved
  // on the worker: forward [0, first) here and [first, c] there, the
  // worker's updates of the shared ancestors kept apart and added after;
  // backward the ancestors here first, then both halves at once.
  const split = factor.split;
  const workers = options.workers ?? null;
  const par =
    split !== null && workers !== null && L.buffer instanceof SharedArrayBuffer && sym.storedValues >= (options.parallelMinValues ?? PARALLEL_MIN_SOLVE_VALUES)
      ? split
      : null;
  const y = par !== null ? new Float64Array(new SharedArrayBuffer(8 * Math.max(1, n))) : new Float64Array(n);
  let threadsUsed = par !== null && nrhs > 0 ? 2 : 1;
  for (let r = 0; r < nrhs; r++) {
    const off = r * n;
    for (let k = 0; k < n; k++) y[k] = b[off + perm[k]];
    let done = false;
    if (par !== null) {
      const ancestorsFrom = superStart[par.c + 1];
      const delta = new Float64Array(new SharedArrayBuffer(8 * Math.max(1, n)));
      const job = {
        L: L.buffer as SharedArrayBuffer,
        superStart,
        rowPtr,
        superRows,
        valuePtr,
        y: y.buffer as SharedArrayBuffer,
        delta: delta.buffer as SharedArrayBuffer,
        s0: par.first,
        s1: par.c + 1,
        maxFront: sym.maxFront,
      };
      const timeout = 60_000 + sym.storedValues / 1e4;
      const fw = workers!.startSolveJob('forward', job);
      if (fw !== null) {
        forwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, par.first, y, n);
        if (fw.join(timeout) === 'done') {
          for (let i = ancestorsFrom; i < n; i++) y[i] += delta[i];
          forwardRange(L, superStart, rowPtr, superRows, valuePtr, y, par.c + 1, nSuper, y, n);
          backwardRange(L, superStart, rowPtr, superRows, valuePtr, y, par.c + 1, nSuper, t);
          const bw = workers!.startSolveJob('backward', job);
          if (bw === null) {
            backwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, par.c + 1, t);
            done = true;
          } else {
            backwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, par.first, t);
            if (bw.join(timeout) === 'done') done = true;
            else bw.terminate();
          }
        } else {
          fw.terminate();
        }
      }
      // a worker that failed part-way: this right-hand side again, on one thread
      if (!done) {
        threadsUsed = 1;
        for (let k = 0; k < n; k++) y[k] = b[off + perm[k]];
      }
    }
    if (!done) {
      forwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, nSuper, y, n);
      backwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, nSuper, t);
    }
    for (let k = 0; k < n; k++) x[off + perm[k]] = y[k];
  }
  if (options.report !== undefined) options.report.threads = threadsUsed;
  return x;
}

/** Factors with fewer stored values are solved on one thread. */
const PARALLEL_MIN_SOLVE_VALUES = 4e6;

export interface SolveCholeskyOptions {
  /** the second thread, owned by the caller: with it, a factor made on two threads is solved on two */
  readonly workers?: SolverThreads;
  /** lower the size limit for the second thread (tests use it on small factors) */
  readonly parallelMinValues?: number;
  /** when given, receives the number of threads the solves used */
  readonly report?: { threads: number };
}
