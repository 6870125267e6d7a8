/**
 * Numeric factorisation A(p, p) = L L^T by the supernodal multifrontal method (I. S. Duff and
 * J. K. Reid, "The multifrontal solution of indefinite sparse symmetric linear equations", ACM
 * TOMS 9, 1983; J. W. H. Liu, "The multifrontal method for sparse matrix solution: theory and
 * practice", SIAM Review 34, 1992), on the structure of a symbolic analysis (symbolic.ts). The
 * loop over supernodes is in multifrontal.ts; one subtree may go to the caller's second
 * thread (threads.ts).
 *
 * Memory of the supernodal factor: 8 bytes per stored value (nnz(L) plus the explicit zeros of
 * relaxed supernodes, 5-20 % here), 4 bytes per row index of a supernode (shared by its
 * columns), and O(n) pointers: 9-11 bytes per nonzero of L on 2D stiffness matrices. The fronts
 * and the update stack live in a WebAssembly memory reused by every factorisation of the
 * process (wasm-kernel.ts); it grows to the largest front plus stack seen and is not returned
 * to the system.
 */

import { InternalError } from '../model/errors.js';
import { type SymmetricCsc, maxDiagonal } from './sparse.js';
import { PANEL, type SimdKernel } from './dense.js';
import { sharedWasmHeap, type ExtendAdd, type ZeroLower } from './wasm-kernel.js';
import { childLists } from './etree.js';
import { checkPattern, type SymbolicFactor } from './symbolic.js';
import { DEFAULT_PIVOT_TOLERANCE, SolverPivotError } from './pivot.js';
import { chooseSplit, factorRange, mainThreadKernels, type RangeContext } from './multifrontal.js';
import type { SolverThreads } from './threads.js';

/**
 * A supernodal Cholesky factor. For supernode s with k columns and m rows,
 * the values are the row-major lower trapezoid of its m x k block: row a
 * (a = 0 .. m-1, row index superRows[rowPtr[s] + a]) holds min(a+1, k)
 * entries, starting at valuePtr[s] + offset(a) with
 * offset(a) = a(a+1)/2 for a < k and k(k+1)/2 + (a-k) k otherwise.
 */
export interface CholeskyFactor {
  readonly symbolic: SymbolicFactor;
  readonly values: Float64Array;
  /** bytes held by the factor: values, row indices and pointers */
  readonly bytes: number;
  /** threads that factorised it (1, or 2 when a subtree went to a worker) */
  readonly threads: number;
  /** for the triangular solves of a factor made on two threads: the worker's subtree [first, c] */
  readonly split: { readonly first: number; readonly c: number } | null;
}

export interface FactorOptions {
  /** relative pivot tolerance (default DEFAULT_PIVOT_TOLERANCE) */
  readonly pivotTolerance?: number;
  /**
   * Dense update kernel: 'simd' (WebAssembly SIMD, wasm-kernel.ts), 'js'
   * (plain JavaScript), or 'auto' (default): 'simd' when the engine has it
   * and the front and update stack fit in a 32-bit WebAssembly memory.
   * Both compute the same sums in the same order of pairs, so results agree
   * to rounding.
   */
  readonly kernel?: 'auto' | 'simd' | 'js';
  /**
   * The second thread, owned by the caller: with it, a worker factorises one subtree of the
   * supernodal tree when the factorisation has at least PARALLEL_MIN_FLOPS flops; without it,
   * everything runs on this thread. Results are identical either way (same operations in the
   * same order within each front).
   */
  readonly workers?: SolverThreads;
  /** lower the flop limit for the second thread (tests use it on small matrices) */
  readonly parallelMinFlops?: number;
}

/** Factorisations with fewer flops stay on one thread (measured start-up of a worker: about 30 ms). */
const PARALLEL_MIN_FLOPS = 5e8;

/**
 * Numeric factorisation by the supernodal multifrontal method. For each
 * supernode, in postorder: its frontal matrix (dense, row-major lower) is
 * assembled from its bucket of A's entries and the children's update
 * matrices (extend-add), its k pivot columns are factorised (dense.ts:
 * panel-blocked Cholesky of the k x k block with the triangular solve of the
 * rows below), its rows are copied to the factor, and the Schur complement
 * is formed by a register-blocked symmetric rank-k update written straight
 * onto the update stack. The first pivot d that is not above
 * pivotTolerance * max diag(A), or not finite, throws SolverPivotError.
 * The analysis can be reused for any matrix with the same pattern.
 */
export function factorCholesky(a: SymmetricCsc, symbolic: SymbolicFactor, options: FactorOptions = {}): CholeskyFactor {
  const { n, perm, nSuper, superStart, superParent, rowPtr, superRows, valuePtr, maxFront, stackPeak } = symbolic;
  checkPattern(a, symbolic, 'factorCholesky');
  const tol = options.pivotTolerance ?? DEFAULT_PIVOT_TOLERANCE;
  const threshold = tol * maxDiagonal(a);
  const { entryPtr, entryOrder, entryOffset } = symbolic;
  const av = a.values;

  // A second thread takes one subtree when the work is large enough to pay
  // for starting it (about 30 ms) and a balanced split exists.
  const workers = options.workers ?? null;
  const split = workers !== null && symbolic.flops >= (options.parallelMinFlops ?? PARALLEL_MIN_FLOPS) ? chooseSplit(superStart, superParent, rowPtr) : null;
  const lBuffer = split !== null ? new SharedArrayBuffer(symbolic.storedValues * 8) : null;
  const L = lBuffer !== null ? new Float64Array(lBuffer) : new Float64Array(symbolic.storedValues);
  let threadsUsed = 1;
  const ws = reserveWorkspace(maxFront, stackPeak, options.kernel ?? 'auto');
  // values of A in entry order
  const entryValues = split !== null ? new Float64Array(new SharedArrayBuffer(8 * Math.max(1, entryOrder.length)), 0, entryOrder.length) : new Float64Array(entryOrder.length);
  for (let q = 0; q < entryOrder.length; q++) entryValues[q] = av[entryOrder[q]];
  const { head: sHead, next: sNext } = childLists(superParent);
  const ctxFor = (s0: number, s1: number, updStart: Float64Array): RangeContext => ({
    s0,
    s1,
    superStart,
    superParent,
    rowPtr,
    superRows,
    rowBase: 0,
    valuePtr,
    entryPtr,
    entryValues,
    entryOffset,
    entryBase: 0,
    L,
    front: ws.front,
    stack: ws.stack,
    rel: ws.rel,
    map: new Int32Array(n),
    sHead,
    sNext,
    updStart,
    threshold,
    panelScratch: new Float64Array(PANEL),
    zeroLower: ws.zeroLower,
    extendAdd: ws.extendAdd,
    relByte: ws.relByte,
    stackByte: ws.stackByte,
    simdFront: ws.simdFront,
    simdStack: ws.simdStack,
  });
  const kern = mainThreadKernels();
  const updStart = new Float64Array(nSuper);
  const fail = (col: number, pivot: number): SolverPivotError => new SolverPivotError(col, perm[col], pivot, threshold);

  // main: [0, first); worker: [first, c]; then main: (c, nSuper)
  const worker =
    split !== null && lBuffer !== null && workers !== null
      ? workers.startSubtree({
          n,
          first: split.first,
          c: split.c,
          superStart,
          superParent,
          rowPtr,
          superRows,
          valuePtr,
          entryPtr,
          entryValues,
          entryOffset,
          threshold,
          lBuffer,
          useWasm: ws.wasm,
        })
      : null;
  if (split !== null && worker !== null) {
    const r1 = factorRange(ctxFor(0, split.first, updStart), kern, 0);
    if (r1.failedColumn >= 0) {
      worker.terminate();
      throw fail(r1.failedColumn, r1.pivot);
    }
    // generous (the worker's part at 1 GFLOP/s plus a minute): a stuck
    // worker is stopped and its part done on this thread
    const j = worker.join(60_000 + symbolic.flops / 1e6);
    let top = r1.top;
    if (j.state === 'pivot') throw fail(j.failedColumn, j.pivot);
    if (j.state === 'done') {
      updStart[split.c] = top;
      ws.stack.set(worker.handoff, top);
      top += worker.handoff.length;
    } else {
      worker.terminate();
      const r2 = factorRange(ctxFor(split.first, split.c + 1, updStart), kern, top);
      if (r2.failedColumn >= 0) throw fail(r2.failedColumn, r2.pivot);
      top = r2.top;
    }
    const r3 = factorRange(ctxFor(split.c + 1, nSuper, updStart), kern, top);
    if (r3.failedColumn >= 0) throw fail(r3.failedColumn, r3.pivot);
    threadsUsed = j.state === 'done' ? 2 : 1;
  } else {
    const r = factorRange(ctxFor(0, nSuper, updStart), kern, 0);
    if (r.failedColumn >= 0) throw fail(r.failedColumn, r.pivot);
  }
  const bytes = L.byteLength + symbolic.superRows.byteLength + symbolic.rowPtr.byteLength + symbolic.valuePtr.byteLength + symbolic.superStart.byteLength + symbolic.perm.byteLength + symbolic.invPerm.byteLength;
  const solveSplit = threadsUsed === 2 ? chooseSplit(superStart, superParent, rowPtr, 'values') : null;
  return { symbolic, values: L, bytes, threads: threadsUsed, split: solveSplit };
}

/** The fronts, the update stack and the relative-index scratch of one factorisation on this thread. */
interface Workspace {
  readonly front: Float64Array;
  readonly stack: Float64Array;
  readonly rel: Int32Array;
  /** byte offsets of rel and of the stack in the WebAssembly memory (used by its helpers) */
  readonly relByte: number;
  readonly stackByte: number;
  readonly simdFront: SimdKernel | null;
  readonly simdStack: SimdKernel | null;
  readonly zeroLower: ZeroLower | null;
  readonly extendAdd: ExtendAdd | null;
  /** true when the workspace lives in the WebAssembly memory and its kernels run */
  readonly wasm: boolean;
}

/**
 * The workspace for fronts of order maxFront and an update stack of stackPeak doubles: in the
 * process's WebAssembly memory (layout in doubles: [front | update stack | rel as int32]) unless
 * kernel is 'js' or WebAssembly is not available here, else plain arrays.
 */
function reserveWorkspace(maxFront: number, stackPeak: number, kernel: 'auto' | 'simd' | 'js'): Workspace {
  const frontLen = maxFront * maxFront;
  const stackLen = Math.max(1, stackPeak);
  let front: Float64Array;
  let stack: Float64Array;
  let simdFront: SimdKernel | null = null;
  let simdStack: SimdKernel | null = null;
  const heap = kernel === 'js' ? null : sharedWasmHeap();
  // heap layout (doubles): [front | update stack | rel as int32]
  const relDoubles = Math.ceil(maxFront / 2) + 1;
  const view = heap === null ? null : heap.reserve(frontLen + stackLen + relDoubles);
  if (kernel === 'simd' && view === null) throw new InternalError('factorCholesky: the WebAssembly SIMD kernel is not available here');
  let rel: Int32Array;
  const relByte = (frontLen + stackLen) * 8;
  const useHeap = heap !== null && view !== null;
  if (useHeap) {
    front = view.subarray(0, frontLen);
    stack = view.subarray(frontLen, frontLen + stackLen);
    rel = new Int32Array(view.buffer, relByte, maxFront);
    simdFront = { rowBlock4: heap.rowBlock4, fByte: 0, outByte: 0 };
    simdStack = { rowBlock4: heap.rowBlock4, fByte: 0, outByte: frontLen * 8 };
  } else {
    front = new Float64Array(frontLen);
    stack = new Float64Array(stackLen);
    rel = new Int32Array(maxFront);
  }
  return {
    front,
    stack,
    rel,
    relByte,
    stackByte: frontLen * 8,
    simdFront,
    simdStack,
    zeroLower: useHeap ? heap.zeroLower : null,
    extendAdd: useHeap ? heap.extendAdd : null,
    wasm: useHeap,
  };
}
