/**
 * One entry point for a sparse symmetric positive definite solve:
 * ordering -> symbolic analysis -> supernodal numeric factorisation ->
 * triangular solves, with timings and sizes of each phase.
 *
 * Ordering choice: nested dissection from node coordinates when coordinates
 * and the node adjacency are given, approximate minimum degree on the matrix
 * graph otherwise. Measured on the plane-stress benchmark (src/bench/solve.ts):
 * AMD needs about 18 % fewer flops than this nested dissection at 1e5 DOF,
 * nested dissection 17 % fewer than AMD at 1e6 DOF and orders twice as fast
 * there; `ordering` forces either.
 *
 *   const { x, stats } = solveSpd(K, f, { coords, nodeAdjacency, dofsPerNode: 2, fullDofOfRow });
 *
 * Method choice: the symbolic analysis gives the direct factor's memory before any numeric work
 * (estimateFactorBytes). When it exceeds `maxFactorBytes` (default half of this machine's
 * memory), or when `method: 'pcg'` is asked, the system is solved by preconditioned conjugate
 * gradients (pcg.ts) to the relative residual `pcg.tolerance` (default 1e-10), and the stats say
 * so (method 'pcg', iterations, preconditioner). The preconditioner is smoothed-aggregation
 * multigrid (amg.ts) when the mesh is known (node coordinates and the full DOF of each row, two
 * DOFs a node), as it is from the pipeline; otherwise an incomplete Cholesky factor IC(5) on the
 * same fill-reducing ordering (ic.ts). Measured for IC on the plane-stress cantilever at 1e5 DOF
 * (AMD ordering): IC(2) 405 iterations, IC(3) 316, IC(5) 214 (2.5 times the nonzeros of A),
 * against several thousand for a Jacobi preconditioner.
 *
 * Threads: with `threads` 2 (the default) a large factorisation gives one subtree to a second
 * thread, the caller's `workers` when given (kept open), else one started here and closed
 * before returning.
 */
import { totalmem } from 'node:os';
import { performance } from 'node:perf_hooks';

import { InternalError } from '../model/errors.js';
import { type SymmetricCsc, adjacencyGraph, multiplySymmetric, symmetricInfNorm } from './sparse.js';
import { type CsrGraph, type Ordering, orderNatural, restrictOrdering } from './ordering.js';
import { orderAmd } from './amd.js';
import { orderNestedDissection } from './nested-dissection.js';
import { analyzeCholeskyWithin, type RelaxOptions, type SymbolicFactor } from './symbolic.js';
import { factorCholesky, type CholeskyFactor } from './numeric.js';
import { solveCholesky } from './triangular.js';
import { SolverThreads } from './threads.js';
import { factorIncompleteCholesky, type IncompleteCholesky } from './ic.js';
import { solvePcg, type PcgPreconditioner } from './pcg.js';
import { amgPreconditioner, buildAmg, rigidModes } from './amg.js';

export type OrderingMethod = 'nested-dissection' | 'amd' | 'natural';
export type SolveMethod = 'cholesky' | 'pcg';

/** Default limit of the direct factor's memory: half of this machine's memory. */
export function defaultMaxFactorBytes(): number {
  return totalmem() / 2;
}

/**
 * Memory the direct solve would need, from the symbolic analysis alone: the factor's values
 * (8 bytes each), its supernode row indices and pointers (4-8 bytes each), and the multifrontal
 * workspace (the update stack at its peak plus the largest front, 8 bytes a value).
 */
export function estimateFactorBytes(s: SymbolicFactor): number {
  return 8 * s.storedValues + 4 * s.superRows.length + 8 * (s.nSuper + 1) * 3 + 8 * s.n + 8 * (s.stackPeak + s.maxFront * s.maxFront);
}

export interface SolveOptions {
  /** node coordinates [x0, y0, x1, y1, ...] of the mesh the matrix comes from */
  readonly coords?: Float64Array;
  /** node adjacency graph of that mesh (CSR) */
  readonly nodeAdjacency?: CsrGraph;
  /** DOFs per node (default 2); full DOF index = dofsPerNode * node + component */
  readonly dofsPerNode?: number;
  /**
   * When A is a reduced matrix (fixed DOFs removed), the full DOF index of
   * each row of A. Omitted: row r of A is full DOF r.
   */
  readonly fullDofOfRow?: Int32Array;
  /** force an ordering method (default: nested dissection with coordinates from NESTED_DISSECTION_FROM equations on, AMD otherwise) */
  readonly ordering?: OrderingMethod;
  /** relative pivot tolerance (see factorCholesky) */
  readonly pivotTolerance?: number;
  /** 1 keeps the factorisation and the solves on this thread (default 2: a second thread for large ones) */
  readonly threads?: 1 | 2;
  /**
   * the second thread, owned by the caller and left open (with threads 2); without it solveSpd
   * starts one when a factorisation is large enough and closes it before returning
   */
  readonly workers?: SolverThreads;
  /** relaxed supernode rules (see analyzeCholesky) */
  readonly relax?: RelaxOptions;
  /** leaf size of nested dissection in nodes */
  readonly leafSize?: number;
  /** direct solve: refine x while ||A x - b|| / ||b|| is above this (default: no refinement; at most 2 steps) */
  readonly refineAbove?: number;
  /** 'auto' (default): Cholesky unless its estimated memory exceeds maxFactorBytes, then PCG */
  readonly method?: 'auto' | SolveMethod;
  /** largest estimated direct-factor memory in bytes for the automatic choice (default defaultMaxFactorBytes()) */
  readonly maxFactorBytes?: number;
  /**
   * the iterative solve: relative residual (default 1e-10), iteration limit, preconditioner
   * ('amg', the default where the mesh is known, or 'ic'), IC fill level (default 5)
   */
  readonly pcg?: { readonly tolerance?: number; readonly maxIterations?: number; readonly fillLevel?: number; readonly preconditioner?: 'amg' | 'ic' };
}

export interface SolveStats {
  readonly n: number;
  /** nonzeros of the full symmetric A */
  readonly nnzA: number;
  /** nonzeros of L, diagonal included */
  readonly nnzL: number;
  /** sum over columns of colCount^2 */
  readonly flops: number;
  readonly ordering: OrderingMethod;
  readonly nSupernodes: number;
  /** values stored by the supernodal factor (>= nnzL: relaxed supernodes store some zeros) */
  readonly storedValues: number;
  /** bytes held by the factor (values, indices, pointers, permutation) */
  readonly factorBytes: number;
  readonly bytesPerNnzL: number;
  /** peak bytes of the multifrontal update stack plus the largest front (reused by later factorisations) */
  readonly workspaceBytes: number;
  /** threads of the numeric factorisation (2 when a subtree went to a worker) */
  readonly threads: number;
  /** threads of the triangular solves */
  readonly solveThreads: number;
  readonly seconds: { readonly ordering: number; readonly symbolic: number; readonly numeric: number; readonly solve: number };
  /** max over right-hand sides of ||A x - b|| / ||b|| (2-norms; 0 when b = 0 and x = 0) */
  readonly relativeResidual: number;
  /**
   * max over right-hand sides of the normwise backward error ||b - A x|| / (||A|| ||x|| + ||b||)
   * (infinity norms): a small multiple of 1.1e-16 for a stable solve, where the relative residual
   * also carries ||A|| ||x|| / ||b||
   */
  readonly backwardError: number;
  /** steps of iterative refinement after the direct solve (0 when the first residual was small enough) */
  readonly refinementSteps: number;
  /** 'cholesky' (direct) or 'pcg' (the iterative fallback) */
  readonly method: SolveMethod;
  /** the direct factor's memory estimated by the symbolic analysis, and the limit it was compared with */
  readonly estimatedFactorBytes: number;
  readonly maxFactorBytes: number;
  /** conjugate gradient iterations (summed over right-hand sides; 0 for the direct solve) */
  readonly iterations: number;
  /** the preconditioner of the iterative solve ('' for the direct solve) */
  readonly preconditioner: string;
}

/**
 * Below this many equations AMD is the default even with coordinates: on raiser's own meshes it
 * fills less there and is quicker to compute (measured nnz(L), AMD against nested dissection: a
 * bracket of 2,940 DOF 9.58e4 against 1.01e5, a link plate of 10,652 DOF 4.50e5 against 4.74e5;
 * at 112,986 DOF nested dissection wins, 7.84e6 against 8.05e6 with 12% fewer flops).
 */
const NESTED_DISSECTION_FROM = 50_000;

/** Computes the fill-reducing ordering solveSpd would use. */
export function chooseOrdering(a: SymmetricCsc, options: SolveOptions = {}): { ordering: Ordering; method: OrderingMethod } {
  const haveGeometry = options.coords !== undefined && options.nodeAdjacency !== undefined;
  const method: OrderingMethod = options.ordering ?? (haveGeometry && a.n >= NESTED_DISSECTION_FROM ? 'nested-dissection' : 'amd');
  if (method === 'natural') return { ordering: orderNatural(a.n), method };
  if (method === 'amd') return { ordering: orderAmd(adjacencyGraph(a)), method };
  if (!haveGeometry) throw new RangeError('chooseOrdering: nested dissection needs coords and nodeAdjacency');
  const dpn = options.dofsPerNode ?? 2;
  const full = orderNestedDissection(options.nodeAdjacency!, options.coords!, dpn, { leafSize: options.leafSize });
  const nFull = full.perm.length;
  if (options.fullDofOfRow === undefined) {
    if (nFull !== a.n) {
      throw new RangeError(`chooseOrdering: mesh has ${nFull} DOFs, matrix ${a.n}; pass fullDofOfRow for a reduced matrix`);
    }
    return { ordering: full, method };
  }
  if (options.fullDofOfRow.length !== a.n) throw new RangeError('chooseOrdering: fullDofOfRow length differs from the matrix order');
  const rowOfFull = new Int32Array(nFull).fill(-1);
  options.fullDofOfRow.forEach((d, r) => {
    if (d < 0 || d >= nFull || rowOfFull[d] !== -1) throw new RangeError(`chooseOrdering: fullDofOfRow[${r}] = ${d} invalid or repeated`);
    rowOfFull[d] = r;
  });
  return { ordering: restrictOrdering(full.perm, rowOfFull), method };
}

/**
 * The normwise backward error of x for one right-hand side, in the infinity norm:
 * ||b - A x|| / (||A|| ||x|| + ||b||), the smallest relative change to A and b that makes x exact
 * (J. L. Rigal & J. Gaches, J. ACM 14 (1967) 543-548; N. J. Higham, Accuracy and Stability of
 * Numerical Algorithms, 2nd ed., SIAM 2002, thm. 7.1). A backward-stable solve gives a small
 * multiple of the unit round-off 1.1e-16 whatever the conditioning, where ||A x - b|| / ||b|| also
 * carries ||A|| ||x|| / ||b||, which is large for a stiffness matrix loaded at a few nodes.
 */
export function backwardError(a: SymmetricCsc, x: Float64Array, b: Float64Array): number {
  return residualMeasures(a, x, b, 1).backward;
}

/**
 * Both measures of a solution, with one product A x per right-hand side: the largest over the
 * right-hand sides of the relative residual ||A x - b|| / ||b|| (2-norms) and of the backward
 * error (infinity norms, see backwardError).
 */
export function residualMeasures(a: SymmetricCsc, x: Float64Array, b: Float64Array, nrhs = 1): { relative: number; backward: number } {
  const n = a.n;
  const ax = new Float64Array(n);
  const normA = symmetricInfNorm(a);
  let relative = 0;
  let backward = 0;
  for (let r = 0; r < nrhs; r++) {
    const xr = x.subarray(r * n, (r + 1) * n);
    const br = b.subarray(r * n, (r + 1) * n);
    multiplySymmetric(a, xr, ax);
    let num = 0;
    let den = 0;
    let rMax = 0;
    let xMax = 0;
    let bMax = 0;
    for (let i = 0; i < n; i++) {
      const d = ax[i] - br[i];
      num += d * d;
      den += br[i] * br[i];
      rMax = Math.max(rMax, Math.abs(d));
      xMax = Math.max(xMax, Math.abs(xr[i]));
      bMax = Math.max(bMax, Math.abs(br[i]));
    }
    const rel = den > 0 ? Math.sqrt(num / den) : Math.sqrt(num);
    const eDen = normA * xMax + bMax;
    const eta = eDen > 0 ? rMax / eDen : rMax;
    if (rel > relative || Number.isNaN(rel)) relative = rel;
    if (eta > backward || Number.isNaN(eta)) backward = eta;
  }
  return { relative, backward };
}

/** max over right-hand sides of ||A x - b|| / ||b||. */
export function relativeResidual(a: SymmetricCsc, x: Float64Array, b: Float64Array, nrhs = 1): number {
  return residualMeasures(a, x, b, nrhs).relative;
}

/**
 * Solves A x = b for a symmetric positive definite A (lower triangle CSC).
 * b may hold several right-hand sides of length n one after another.
 * Throws SolverPivotError when A is singular or not positive definite (direct
 * solve); PcgError or IncompleteCholeskyError from the iterative solve when it
 * finds A indefinite or does not reach its tolerance. `factor` is null after
 * the iterative solve.
 */
export function solveSpd(a: SymmetricCsc, b: Float64Array, options: SolveOptions = {}): { x: Float64Array; stats: SolveStats; factor: CholeskyFactor | null } {
  const n = a.n;
  if (n === 0 ? b.length !== 0 : b.length % n !== 0 || b.length === 0) {
    throw new RangeError(`solveSpd: right-hand side length ${b.length} is not a positive multiple of ${n}`);
  }
  const nrhs = n === 0 ? 0 : b.length / n;
  const t0 = performance.now();
  const { ordering, method: orderingName } = chooseOrdering(a, options);
  const t1 = performance.now();
  const maxFactorBytes = options.maxFactorBytes ?? defaultMaxFactorBytes();
  // The factor's size from the column counts first: when even 12 bytes per nonzero of L exceed
  // the limit, the supernodal structure (as large as L's row indices) is never built.
  const analysed = analyzeCholeskyWithin(a, ordering, options.method === 'cholesky' ? Infinity : maxFactorBytes, options.relax);
  const symbolic = 'superStart' in analysed ? analysed : null;
  const t2 = performance.now();
  const estimatedFactorBytes = symbolic ? estimateFactorBytes(symbolic) : 12 * analysed.nnzL;
  const method: SolveMethod = options.method === 'pcg' || (options.method !== 'cholesky' && estimatedFactorBytes > maxFactorBytes) ? 'pcg' : 'cholesky';
  const common = {
    n,
    nnzA: analysed.nnzA,
    nnzL: analysed.nnzL,
    flops: analysed.flops,
    ordering: orderingName,
    nSupernodes: symbolic?.nSuper ?? 0,
    storedValues: symbolic?.storedValues ?? 0,
    estimatedFactorBytes,
    maxFactorBytes,
  };
  const started: Analysed = { common, seconds: [(t1 - t0) / 1e3, (t2 - t1) / 1e3], t2 };
  if (method === 'pcg') return solveIterative(a, b, nrhs, ordering, options, started);
  if (symbolic === null) throw new InternalError('solveSpd: no symbolic factor for the direct solve');
  const own = options.threads !== 1 && options.workers === undefined ? new SolverThreads() : null;
  try {
    const workers = options.threads === 1 ? undefined : (options.workers ?? own ?? undefined);
    return solveDirect(a, b, nrhs, symbolic, options, workers, started);
  } finally {
    own?.close();
  }
}

/**
 * The iterative branch of solveSpd: conjugate gradients preconditioned by smoothed-aggregation
 * multigrid where the mesh is known, by IC(fill level) on the fill-reducing ordering otherwise.
 */
function solveIterative(
  a: SymmetricCsc,
  b: Float64Array,
  nrhs: number,
  ordering: Ordering,
  options: SolveOptions,
  { common, seconds, t2 }: Analysed,
): { x: Float64Array; stats: SolveStats; factor: null } {
  const n = a.n;
  const pc = options.pcg ?? {};
  // Smoothed-aggregation multigrid needs the rigid motions, so the mesh: node coordinates and
  // the full DOF of each row with two DOFs a node. Without them, incomplete Cholesky.
  const geometryKnown = options.coords !== undefined && options.fullDofOfRow !== undefined && (options.dofsPerNode ?? 2) === 2;
  const useAmg = (pc.preconditioner ?? (geometryKnown ? 'amg' : 'ic')) === 'amg';
  if (useAmg && !geometryKnown) throw new RangeError('solveSpd: the multigrid preconditioner needs coords and fullDofOfRow (two DOFs a node)');
  let pre: IncompleteCholesky | PcgPreconditioner;
  let preBytes: number;
  let preWords: string;
  if (useAmg) {
    const modes = rigidModes(options.coords!, options.fullDofOfRow!);
    const h = buildAmg(a, modes.blockOf, modes.nBlocks, modes.B);
    pre = amgPreconditioner(a, h);
    preBytes = h.bytes;
    preWords = `smoothed-aggregation multigrid, ${h.sizes.length} levels (${h.sizes.join(', ')} unknowns), operator complexity ${h.complexity.toFixed(2)}`;
  } else {
    const ic = factorIncompleteCholesky(a, ordering, { fillLevel: pc.fillLevel ?? 5 });
    pre = ic;
    preBytes = ic.bytes;
    preWords = `IC(${ic.fillLevel}), ${ic.nnz} nonzeros${ic.shift > 0 ? `, diagonal shift ${ic.shift}` : ''}`;
  }
  const t3 = performance.now();
  const x = new Float64Array(b.length);
  let iterations = 0;
  for (let r = 0; r < nrhs; r++) {
    const res = solvePcg(pre, b.subarray(r * n, (r + 1) * n), { tolerance: pc.tolerance, maxIterations: pc.maxIterations });
    x.set(res.x, r * n);
    iterations += res.iterations;
  }
  const t4 = performance.now();
  const measured = residualMeasures(a, x, b, nrhs);
  const stats: SolveStats = {
    ...common,
    factorBytes: preBytes,
    bytesPerNnzL: 0,
    workspaceBytes: 8 * 6 * n,
    threads: 1,
    solveThreads: 1,
    seconds: { ordering: seconds[0], symbolic: seconds[1], numeric: (t3 - t2) / 1e3, solve: (t4 - t3) / 1e3 },
    relativeResidual: measured.relative,
    backwardError: measured.backward,
    refinementSteps: 0,
    method: 'pcg',
    iterations,
    preconditioner: preWords,
  };
  return { x, stats, factor: null };
}

/** What solveSpd knows before the numeric work: the shared statistics and the times so far. */
interface Analysed {
  readonly common: Pick<SolveStats, 'n' | 'nnzA' | 'nnzL' | 'flops' | 'ordering' | 'nSupernodes' | 'storedValues' | 'estimatedFactorBytes' | 'maxFactorBytes'>;
  /** ordering and symbolic analysis, seconds */
  readonly seconds: readonly [number, number];
  /** performance.now() at the end of the symbolic analysis */
  readonly t2: number;
}

/** The direct branch of solveSpd: numeric factorisation, triangular solves, optional refinement. */
function solveDirect(
  a: SymmetricCsc,
  b: Float64Array,
  nrhs: number,
  symbolic: SymbolicFactor,
  options: SolveOptions,
  workers: SolverThreads | undefined,
  { common, seconds, t2 }: Analysed,
): { x: Float64Array; stats: SolveStats; factor: CholeskyFactor } {
  const n = a.n;
  const factor = factorCholesky(a, symbolic, { pivotTolerance: options.pivotTolerance, workers });

  const t3 = performance.now();
  const solveReport = { threads: 1 };
  const x = solveCholesky(factor, b, nrhs, { workers, report: solveReport });
  const tSolved = performance.now();
  let refinementSteps = 0;
  let measured = residualMeasures(a, x, b, nrhs);
  let residual = measured.relative;
  // Optional iterative refinement in working precision (J. H. Wilkinson, "Rounding Errors in
  // Algebraic Processes", 1963; N. J. Higham, "Accuracy and Stability of Numerical Algorithms",
  // 2nd ed., SIAM 2002, chapter 12): x += A^-1 (b - A x) with the same factor while the residual
  // is above refineAbove. Off by default: measured on the benchmark cantilevers at 5e5-1e6 DOF,
  // the residual (8e-11 to 2e-10) is already at the floor eps ||A|| ||x|| / ||b|| that a
  // solution rounded to doubles cannot go below, and a step there costs a matrix product and
  // two triangular solves for at most a 30 % smaller residual.
  const refineAbove = options.refineAbove ?? Infinity;
  while (residual > refineAbove && refinementSteps < 2) {
    const r = new Float64Array(b.length);
    const ax = new Float64Array(n);
    for (let k = 0; k < nrhs; k++) {
      multiplySymmetric(a, x.subarray(k * n, (k + 1) * n), ax);
      for (let i = 0; i < n; i++) r[k * n + i] = b[k * n + i] - ax[i];
    }
    const dx = solveCholesky(factor, r, nrhs, { workers });
    const trial = x.slice();
    for (let i = 0; i < x.length; i++) trial[i] += dx[i];
    const trialMeasured = residualMeasures(a, trial, b, nrhs);
    const res = trialMeasured.relative;
    refinementSteps++;
    if (!(res < residual)) break;
    x.set(trial);
    residual = res;
    measured = trialMeasured;
  }
  // the solve time is the triangular solves (and the refinement steps when there are any), not the residual check
  const t4 = refinementSteps > 0 ? performance.now() : tSolved;
  const stats: SolveStats = {
    ...common,
    refinementSteps,
    factorBytes: factor.bytes,
    bytesPerNnzL: symbolic.nnzL > 0 ? factor.bytes / symbolic.nnzL : 0,
    workspaceBytes: 8 * (symbolic.stackPeak + symbolic.maxFront * symbolic.maxFront),
    threads: factor.threads,
    solveThreads: solveReport.threads,
    seconds: { ordering: seconds[0], symbolic: seconds[1], numeric: (t3 - t2) / 1e3, solve: (t4 - t3) / 1e3 },
    relativeResidual: residual,
    backwardError: measured.backward,
    method: 'cholesky',
    iterations: 0,
    preconditioner: '',
  };
  return { x, stats, factor };
}
